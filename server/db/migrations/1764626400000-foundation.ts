import type { MigrationInterface, QueryRunner } from 'typeorm'

/** Organisations, users, sessions, the audit log and demo seed markers. */
export class Foundation1764626400000 implements MigrationInterface {
  name = 'Foundation1764626400000'

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("CREATE TABLE `audit_entry` (`id` bigint NOT NULL AUTO_INCREMENT, `at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `actorId` uuid NULL, `actorEmail` varchar(254) NULL, `entity` varchar(40) NOT NULL, `entityId` varchar(64) NOT NULL, `action` varchar(40) NOT NULL, `detail` json NULL, INDEX `IDX_9d18bd4a32fc0cd8ff82b12037` (`at`), INDEX `IDX_e4be711ec64c81474fdf4cae8f` (`entity`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `organisation` (`id` uuid NOT NULL, `name` varchar(160) NOT NULL, `kind` enum ('maker', 'customer') NOT NULL, `tier` enum ('oem', 'distributor') NULL, `currency` char(3) NOT NULL DEFAULT 'USD', `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), UNIQUE INDEX `IDX_d9428f9c8e3052d6617e3aab0e` (`name`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `seed_marker` (`step` varchar(64) NOT NULL, `at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), PRIMARY KEY (`step`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `session` (`id` varchar(128) NOT NULL, `expiresAt` bigint NOT NULL, `userId` uuid NULL, `data` mediumtext NOT NULL, INDEX `IDX_5d97cf9773002b16861b4bb8ae` (`expiresAt`), INDEX `IDX_3d2f174ef04fb312fdebd0ddc5` (`userId`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `user` (`id` uuid NOT NULL, `email` varchar(254) NOT NULL, `name` varchar(160) NOT NULL, `passwordHash` varchar(100) NULL, `role` enum ('admin', 'sales', 'buyer') NOT NULL, `units` enum ('si', 'us') NOT NULL DEFAULT 'si', `organisationId` uuid NOT NULL, `disabledAt` datetime(3) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), UNIQUE INDEX `IDX_e12875dfb3b1d92d7d7c5377e2` (`email`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("ALTER TABLE `user` ADD CONSTRAINT `FK_642763a1acbc9672d38429ea62a` FOREIGN KEY (`organisationId`) REFERENCES `organisation`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION")
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `user` DROP FOREIGN KEY `FK_642763a1acbc9672d38429ea62a`")
    await queryRunner.query("DROP TABLE `user`")
    await queryRunner.query("DROP TABLE `session`")
    await queryRunner.query("DROP TABLE `seed_marker`")
    await queryRunner.query("DROP TABLE `organisation`")
    await queryRunner.query("DROP TABLE `audit_entry`")
  }
}
