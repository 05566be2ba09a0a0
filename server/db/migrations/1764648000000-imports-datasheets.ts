import type { MigrationInterface, QueryRunner } from 'typeorm'

/** Datasheet files of families and variants; import batches (previewed uploads awaiting commit). */
export class ImportsDatasheets1764648000000 implements MigrationInterface {
  name = 'ImportsDatasheets1764648000000'

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("CREATE TABLE `datasheet` (`id` uuid NOT NULL, `familyId` uuid NULL, `variantId` uuid NULL, `storedName` varchar(64) NOT NULL, `originalName` varchar(255) NOT NULL, `sizeBytes` int NOT NULL, `sha256` char(64) NOT NULL, `uploadedById` uuid NULL, `uploadedByEmail` varchar(254) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `IDX_239bacc90311ef882aef0123e8` (`familyId`), INDEX `IDX_becf4c2f9674df2f552d450810` (`variantId`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `import_batch` (`id` uuid NOT NULL, `kind` enum ('catalogue', 'performance') NOT NULL, `status` enum ('previewed', 'committed') NOT NULL DEFAULT 'previewed', `fileName` varchar(255) NOT NULL, `fileSha256` char(64) NOT NULL, `content` longtext NOT NULL, `plan` json NOT NULL, `catalogueRevision` int NOT NULL, `createdById` uuid NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `committedAt` datetime(3) NULL, INDEX `IDX_9daff5a71256562ba9bf74f555` (`kind`, `createdAt`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("ALTER TABLE `datasheet` ADD CONSTRAINT `FK_239bacc90311ef882aef0123e8a` FOREIGN KEY (`familyId`) REFERENCES `motor_family`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `datasheet` ADD CONSTRAINT `FK_becf4c2f9674df2f552d4508104` FOREIGN KEY (`variantId`) REFERENCES `motor_variant`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION")
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('ALTER TABLE `datasheet` DROP FOREIGN KEY `FK_becf4c2f9674df2f552d4508104`')
    await queryRunner.query('ALTER TABLE `datasheet` DROP FOREIGN KEY `FK_239bacc90311ef882aef0123e8a`')
    await queryRunner.query('DROP TABLE `import_batch`')
    await queryRunner.query('DROP TABLE `datasheet`')
  }
}
