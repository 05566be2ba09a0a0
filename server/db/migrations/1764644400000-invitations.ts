import type { MigrationInterface, QueryRunner } from 'typeorm'

/** Invitations: set-password links for invited users, kept as token hashes with expiry and use. */
export class Invitations1764644400000 implements MigrationInterface {
  name = 'Invitations1764644400000'

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("CREATE TABLE `invitation` (`id` uuid NOT NULL, `userId` uuid NOT NULL, `tokenHash` char(64) NOT NULL, `expiresAt` datetime(3) NOT NULL, `usedAt` datetime(3) NULL, `revokedAt` datetime(3) NULL, `createdById` uuid NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `IDX_05191060fae5b5485327709be7` (`userId`), UNIQUE INDEX `IDX_676ef6471ce7176869d73365a4` (`tokenHash`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query('ALTER TABLE `invitation` ADD CONSTRAINT `FK_05191060fae5b5485327709be7f` FOREIGN KEY (`userId`) REFERENCES `user`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION')
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('ALTER TABLE `invitation` DROP FOREIGN KEY `FK_05191060fae5b5485327709be7f`')
    await queryRunner.query('DROP TABLE `invitation`')
  }
}
