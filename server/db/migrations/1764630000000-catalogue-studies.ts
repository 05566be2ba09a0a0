import type { MigrationInterface, QueryRunner } from 'typeorm'

/** Motor families, variants, performance data, demo fans, duty studies and their runs. */
export class CatalogueStudies1764630000000 implements MigrationInterface {
  name = 'CatalogueStudies1764630000000'

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("CREATE TABLE `catalogue_revision` (`id` tinyint NOT NULL, `revision` int NOT NULL, `changedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `demo_fan` (`id` uuid NOT NULL, `code` varchar(40) NOT NULL, `name` varchar(120) NOT NULL, `application` varchar(120) NOT NULL, `refRpm` double NOT NULL, `refDensity` double NOT NULL, `points` json NOT NULL, `suggestedDuty` json NOT NULL, UNIQUE INDEX `IDX_1bcd4712da5b3790aff1427e70` (`code`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `duty_study` (`id` uuid NOT NULL, `organisationId` uuid NOT NULL, `ownerId` uuid NOT NULL, `name` varchar(120) NOT NULL, `input` json NOT NULL, `shareToken` varchar(43) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), `version` int NOT NULL, INDEX `IDX_601d4e8be7a7e1218c0ea1bed7` (`organisationId`), UNIQUE INDEX `IDX_b897b3bdb1b0c0dd7849008c55` (`shareToken`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `motor_performance` (`id` uuid NOT NULL, `variantId` uuid NOT NULL, `tap` varchar(20) NOT NULL, `volts` double NOT NULL, `hz` double NOT NULL, `model` enum ('curve', 'circuit') NOT NULL, `source` enum ('measured', 'datasheet', 'fitted') NOT NULL, `referenceTempC` double NOT NULL DEFAULT '25', `motor` json NOT NULL, `current` tinyint NOT NULL DEFAULT 1, `createdById` uuid NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `IDX_34fc8f53ac7c869029f6dd068a` (`current`), INDEX `IDX_90d4d54c47e12023d7ca798547` (`variantId`, `tap`, `volts`, `hz`, `current`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `motor_variant` (`id` uuid NOT NULL, `partNumber` varchar(40) NOT NULL, `familyId` uuid NOT NULL, `name` varchar(160) NOT NULL, `type` enum ('shaded-pole', 'psc') NOT NULL, `poles` tinyint NOT NULL, `ratedVolts` double NOT NULL, `ratedHz` tinyint NOT NULL, `dualFrequency` tinyint NOT NULL DEFAULT 0, `ratedOutputW` double NOT NULL, `ratedRpm` double NOT NULL, `ratedCurrentA` double NOT NULL, `ratedInputW` double NOT NULL, `lockedRotorTorqueNm` double NOT NULL, `breakdownTorqueNm` double NOT NULL, `frameDiameterMm` double NOT NULL, `stackLengthMm` double NOT NULL, `shaftDiameterMm` double NOT NULL, `shaftLengthMm` double NOT NULL, `mounting` varchar(20) NOT NULL, `rotation` enum ('cw', 'ccw') NOT NULL, `rotationViewedFrom` enum ('shaft-end', 'lead-end') NOT NULL, `otherRotationAvailable` tinyint NOT NULL, `enclosure` varchar(20) NOT NULL, `insulationClass` char(1) NOT NULL, `protection` varchar(20) NOT NULL, `maxAmbientC` double NOT NULL, `capacitorUf` double NULL, `capacitorVac` double NULL, `copperMassG` int NOT NULL, `weightG` int NOT NULL, `moq` int NOT NULL DEFAULT '100', `leadTimeDays` int NOT NULL DEFAULT '42', `lifecycle` enum ('active', 'not-for-new-designs', 'discontinued') NOT NULL DEFAULT 'active', `speedTaps` json NOT NULL, `searchText` varchar(400) NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), `version` int NOT NULL, UNIQUE INDEX `IDX_3598bd8f1a0b4f6c813c153574` (`partNumber`), INDEX `IDX_1b2548cc331c53146d8d507013` (`ratedOutputW`), INDEX `IDX_6865d4e9b2d6657cb9410d1c6a` (`frameDiameterMm`), INDEX `IDX_641e0e4564f7f8ccd3fbadd06f` (`lifecycle`), FULLTEXT INDEX `IDX_f5f1605f368fa5f445c68396ee` (`searchText`), INDEX `IDX_841a6d10c8d5a8b5d7b63914ef` (`type`, `poles`), INDEX `IDX_c1f24c90b25fe9d438e179fa21` (`ratedVolts`, `ratedHz`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `motor_family` (`id` uuid NOT NULL, `code` varchar(24) NOT NULL, `name` varchar(120) NOT NULL, `type` enum ('shaded-pole', 'psc') NOT NULL, `description` text NOT NULL, `lifecycle` enum ('active', 'not-for-new-designs', 'discontinued') NOT NULL DEFAULT 'active', `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), `version` int NOT NULL, UNIQUE INDEX `IDX_7f1f6d1601d2397dd61e60468e` (`code`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `study_run` (`id` uuid NOT NULL, `studyId` uuid NOT NULL, `ranById` uuid NOT NULL, `input` json NOT NULL, `catalogueRevision` int NOT NULL, `candidateCount` int NOT NULL, `result` json NOT NULL, `changes` json NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `IDX_ac15087dc8ea2d7669b8c6bf86` (`studyId`, `createdAt`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("ALTER TABLE `duty_study` ADD CONSTRAINT `FK_601d4e8be7a7e1218c0ea1bed7d` FOREIGN KEY (`organisationId`) REFERENCES `organisation`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `duty_study` ADD CONSTRAINT `FK_cf370a179e48eb176ee0a68f902` FOREIGN KEY (`ownerId`) REFERENCES `user`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `motor_performance` ADD CONSTRAINT `FK_09fd9a401b37c69bd6e7be35faf` FOREIGN KEY (`variantId`) REFERENCES `motor_variant`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `motor_variant` ADD CONSTRAINT `FK_0b75cda5a1985f0da5ecff8f77b` FOREIGN KEY (`familyId`) REFERENCES `motor_family`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `study_run` ADD CONSTRAINT `FK_6e840f958cd7b6107c5cd7a6f8c` FOREIGN KEY (`studyId`) REFERENCES `duty_study`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION")
    await queryRunner.query("INSERT INTO `catalogue_revision` (`id`, `revision`) VALUES (1, 0)")
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `study_run` DROP FOREIGN KEY `FK_6e840f958cd7b6107c5cd7a6f8c`")
    await queryRunner.query("ALTER TABLE `motor_variant` DROP FOREIGN KEY `FK_0b75cda5a1985f0da5ecff8f77b`")
    await queryRunner.query("ALTER TABLE `motor_performance` DROP FOREIGN KEY `FK_09fd9a401b37c69bd6e7be35faf`")
    await queryRunner.query("ALTER TABLE `duty_study` DROP FOREIGN KEY `FK_cf370a179e48eb176ee0a68f902`")
    await queryRunner.query("ALTER TABLE `duty_study` DROP FOREIGN KEY `FK_601d4e8be7a7e1218c0ea1bed7d`")
    await queryRunner.query("DROP TABLE `study_run`")
    await queryRunner.query("DROP TABLE `motor_family`")
    await queryRunner.query("DROP TABLE `motor_variant`")
    await queryRunner.query("DROP TABLE `motor_performance`")
    await queryRunner.query("DROP TABLE `duty_study`")
    await queryRunner.query("DROP TABLE `demo_fan`")
    await queryRunner.query("DROP TABLE `catalogue_revision`")
  }
}
