import type { MigrationInterface, QueryRunner } from 'typeorm'

/** The mail outbox: e-mails written with the business change, sent later by the outbox worker. */
export class MailOutbox1764637200000 implements MigrationInterface {
  name = 'MailOutbox1764637200000'

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("CREATE TABLE `mail_outbox` (`id` uuid NOT NULL, `kind` varchar(40) NOT NULL, `reference` varchar(64) NULL, `to` json NOT NULL, `cc` json NOT NULL, `subject` varchar(300) NOT NULL, `text` mediumtext NOT NULL, `html` mediumtext NULL, `attachments` json NOT NULL, `status` enum ('pending', 'sending', 'sent', 'failed') NOT NULL DEFAULT 'pending', `attempts` int NOT NULL DEFAULT '0', `nextAttemptAt` datetime(3) NOT NULL, `claimedAt` datetime(3) NULL, `lastError` varchar(1000) NULL, `messageId` varchar(255) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `sentAt` datetime(3) NULL, INDEX `IDX_2d09d452fd7bfa7bb3397f2746` (`createdAt`), INDEX `IDX_db184772e6d9593ec15f9e5671` (`kind`, `reference`), INDEX `IDX_4537a362b5e891c5aba08e0c31` (`status`, `nextAttemptAt`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('DROP TABLE `mail_outbox`')
  }
}
