import type { MigrationInterface, QueryRunner } from 'typeorm'

/** Price lists, copper index, account terms, quotes with revisions, acceptance, deposits, payment events and orders. */
export class Quotes1764633600000 implements MigrationInterface {
  name = 'Quotes1764633600000'

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("CREATE TABLE `price_list` (`id` uuid NOT NULL, `code` varchar(40) NOT NULL, `name` varchar(120) NOT NULL, `currency` char(3) NOT NULL, `validFrom` date NOT NULL, `validTo` date NULL, `baseCopperIndexPerKg` int NOT NULL, `copperCreditBelowBase` tinyint NOT NULL DEFAULT 0, `tierDiscountBp` json NOT NULL, `options` json NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), `version` int NOT NULL, UNIQUE INDEX `IDX_a185a5999456c0665e585aef49` (`code`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `price_list_entry` (`id` uuid NOT NULL, `priceListId` uuid NOT NULL, `variantId` uuid NOT NULL, `unitPrice` int NOT NULL, `breaks` json NOT NULL, `moq` int NOT NULL, `leadTimeDays` int NOT NULL, UNIQUE INDEX `IDX_14583013f0f27333d636e89619` (`priceListId`, `variantId`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `copper_index` (`id` uuid NOT NULL, `currency` char(3) NOT NULL, `valuePerKg` int NOT NULL, `effectiveFrom` date NOT NULL, `createdById` uuid NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `IDX_b4558a3d092d875891d01bda6c` (`currency`, `effectiveFrom`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `account_terms` (`organisationId` uuid NOT NULL, `priceListId` uuid NOT NULL, `salesEngineerId` uuid NULL, `overrides` json NOT NULL, `version` int NOT NULL, PRIMARY KEY (`organisationId`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `quote` (`id` uuid NOT NULL, `number` varchar(20) NULL, `state` enum ('requested', 'drafting', 'issued', 'accepted', 'deposit-paid', 'ordered', 'expired', 'withdrawn') NOT NULL, `organisationId` uuid NOT NULL, `requestedById` uuid NULL, `salesEngineerId` uuid NULL, `studyId` uuid NULL, `currency` char(3) NOT NULL, `request` json NULL, `draft` json NULL, `currentRevision` varchar(2) NULL, `validUntil` date NULL, `withdrawnReason` varchar(500) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), `version` int NOT NULL, UNIQUE INDEX `IDX_1d311ec0709425bb0857b389f6` (`number`), INDEX `IDX_db0a1a392120fd1d2cf3cffae0` (`organisationId`, `updatedAt`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `quote_revision` (`id` uuid NOT NULL, `quoteId` uuid NOT NULL, `letter` varchar(2) NOT NULL, `fullNumber` varchar(22) NOT NULL, `issuedById` uuid NOT NULL, `validUntil` date NOT NULL, `total` int NOT NULL, `depositAmount` int NOT NULL, `document` json NOT NULL, `pdfFile` varchar(200) NULL, `issuedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), UNIQUE INDEX `IDX_02076a2d9c8364c53bd96c442e` (`fullNumber`), UNIQUE INDEX `IDX_ec6f5b84b755a9ba2e40269e85` (`quoteId`, `letter`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `quote_sequence` (`year` smallint NOT NULL, `next` int NOT NULL, PRIMARY KEY (`year`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `quote_acceptance` (`quoteId` uuid NOT NULL, `revisionId` uuid NOT NULL, `revision` varchar(2) NOT NULL, `acceptedById` uuid NOT NULL, `acceptedByName` varchar(120) NOT NULL, `purchaseOrderRef` varchar(60) NOT NULL, `acceptedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), PRIMARY KEY (`quoteId`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `deposit_payment` (`id` uuid NOT NULL, `quoteId` uuid NOT NULL, `revision` varchar(2) NOT NULL, `checkoutSessionId` varchar(255) NOT NULL, `amount` int NOT NULL, `currency` char(3) NOT NULL, `status` enum ('open', 'paid', 'expired') NOT NULL, `paymentIntentId` varchar(255) NULL, `paidQuoteId` uuid NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `paidAt` datetime(3) NULL, INDEX `IDX_ea3325c14cfb3431191ad0f7e0` (`quoteId`), UNIQUE INDEX `IDX_dd925d3a7e1a7a33d77ecb3c84` (`checkoutSessionId`), UNIQUE INDEX `IDX_aaa9067a9a29bac13d7d6f72e3` (`paidQuoteId`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `payment_event` (`eventId` varchar(255) NOT NULL, `type` varchar(80) NOT NULL, `receivedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), PRIMARY KEY (`eventId`)) ENGINE=InnoDB")
    await queryRunner.query("CREATE TABLE `sales_order` (`id` uuid NOT NULL, `number` varchar(24) NOT NULL, `quoteId` uuid NOT NULL, `revision` varchar(2) NOT NULL, `organisationId` uuid NOT NULL, `total` int NOT NULL, `depositPaid` int NOT NULL, `currency` char(3) NOT NULL, `purchaseOrderRef` varchar(60) NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `confirmedAt` datetime(3) NULL, UNIQUE INDEX `IDX_51ab5c9d08c7e89ffb38e00ee4` (`number`), UNIQUE INDEX `IDX_873b57645a3ae757c02d500329` (`quoteId`), INDEX `IDX_c7e67b0fa85c1da5ec501defcd` (`organisationId`), PRIMARY KEY (`id`)) ENGINE=InnoDB")
    await queryRunner.query("ALTER TABLE `user` ADD `discountLimitBp` int NOT NULL DEFAULT '0'")
    await queryRunner.query("ALTER TABLE `price_list_entry` ADD CONSTRAINT `FK_07b606c2cb73e9a0b8d812ddfae` FOREIGN KEY (`priceListId`) REFERENCES `price_list`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `account_terms` ADD CONSTRAINT `FK_97ec64621374b22b4bb226d7719` FOREIGN KEY (`organisationId`) REFERENCES `organisation`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `quote` ADD CONSTRAINT `FK_4842c762afa93ca118cd9cfcfbe` FOREIGN KEY (`organisationId`) REFERENCES `organisation`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `quote` ADD CONSTRAINT `FK_dd48d8764242d75e0213de5a9e1` FOREIGN KEY (`requestedById`) REFERENCES `user`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `quote` ADD CONSTRAINT `FK_75bfdb44eac8c65b92d91d7bc51` FOREIGN KEY (`salesEngineerId`) REFERENCES `user`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION")
    await queryRunner.query("ALTER TABLE `quote_revision` ADD CONSTRAINT `FK_a400ea7e9b751008c4dd5d596af` FOREIGN KEY (`quoteId`) REFERENCES `quote`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION")
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `quote_revision` DROP FOREIGN KEY `FK_a400ea7e9b751008c4dd5d596af`")
    await queryRunner.query("ALTER TABLE `quote` DROP FOREIGN KEY `FK_75bfdb44eac8c65b92d91d7bc51`")
    await queryRunner.query("ALTER TABLE `quote` DROP FOREIGN KEY `FK_dd48d8764242d75e0213de5a9e1`")
    await queryRunner.query("ALTER TABLE `quote` DROP FOREIGN KEY `FK_4842c762afa93ca118cd9cfcfbe`")
    await queryRunner.query("ALTER TABLE `account_terms` DROP FOREIGN KEY `FK_97ec64621374b22b4bb226d7719`")
    await queryRunner.query("ALTER TABLE `price_list_entry` DROP FOREIGN KEY `FK_07b606c2cb73e9a0b8d812ddfae`")
    await queryRunner.query("ALTER TABLE `user` DROP COLUMN `discountLimitBp`")
    await queryRunner.query("DROP TABLE `sales_order`")
    await queryRunner.query("DROP TABLE `payment_event`")
    await queryRunner.query("DROP TABLE `deposit_payment`")
    await queryRunner.query("DROP TABLE `quote_acceptance`")
    await queryRunner.query("DROP TABLE `quote_sequence`")
    await queryRunner.query("DROP TABLE `quote_revision`")
    await queryRunner.query("DROP TABLE `quote`")
    await queryRunner.query("DROP TABLE `account_terms`")
    await queryRunner.query("DROP TABLE `copper_index`")
    await queryRunner.query("DROP TABLE `price_list_entry`")
    await queryRunner.query("DROP TABLE `price_list`")
  }
}
