import type { MigrationInterface, QueryRunner } from "typeorm";

/** Buyer tools: saved searches with daily alerts (and their pending matches), favourites, message threads. */
export class BuyerTools1764705600000 implements MigrationInterface {
  name = "BuyerTools1764705600000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `favourite` (`account_id` char(36) NOT NULL, `listing_id` char(36) NOT NULL, `created_at` datetime(3) NOT NULL, INDEX `idx_favourite_account_newest` (`account_id`, `created_at`), PRIMARY KEY (`account_id`, `listing_id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `message_thread` (`id` char(36) NOT NULL, `listing_id` char(36) NOT NULL, `buyer_id` char(36) NOT NULL, `sawyer_id` char(36) NOT NULL, `last_message_at` datetime(3) NOT NULL, `created_at` datetime(3) NOT NULL, INDEX `idx_message_thread_sawyer` (`sawyer_id`, `last_message_at`), INDEX `idx_message_thread_buyer` (`buyer_id`, `last_message_at`), UNIQUE INDEX `idx_message_thread_buyer_listing` (`buyer_id`, `listing_id`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `message` (`id` bigint NOT NULL AUTO_INCREMENT, `thread_id` char(36) NOT NULL, `author_id` char(36) NOT NULL, `body` text NOT NULL, `created_at` datetime(3) NOT NULL, `read_at` datetime(3) NULL, INDEX `idx_message_unread` (`thread_id`, `read_at`), INDEX `idx_message_thread` (`thread_id`, `id`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `saved_search` (`id` char(36) NOT NULL, `account_id` char(36) NOT NULL, `name` varchar(80) NOT NULL, `query` varchar(2000) NOT NULL, `alerts` tinyint NOT NULL, `last_alert_at` datetime(3) NULL, `created_at` datetime(3) NOT NULL, INDEX `idx_saved_search_alerts` (`alerts`, `last_alert_at`), INDEX `idx_saved_search_account` (`account_id`, `created_at`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `saved_search_match` (`id` bigint NOT NULL AUTO_INCREMENT, `saved_search_id` char(36) NOT NULL, `listing_id` char(36) NOT NULL, `matched_at` datetime(3) NOT NULL, `alerted_at` datetime(3) NULL, INDEX `idx_saved_search_match_pending` (`alerted_at`, `saved_search_id`), UNIQUE INDEX `idx_saved_search_match_unique` (`saved_search_id`, `listing_id`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "ALTER TABLE `favourite` ADD CONSTRAINT `FK_d24582e3f008b9aa802318f96eb` FOREIGN KEY (`account_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `favourite` ADD CONSTRAINT `FK_2e3ddca7ee4450e8bdefe3c8023` FOREIGN KEY (`listing_id`) REFERENCES `listing`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `message_thread` ADD CONSTRAINT `FK_96ddf47e44ee668b35d156f7ac8` FOREIGN KEY (`listing_id`) REFERENCES `listing`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `message_thread` ADD CONSTRAINT `FK_335ad509e73110868125436d401` FOREIGN KEY (`buyer_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `message_thread` ADD CONSTRAINT `FK_110b13043049d56cdd429d2b454` FOREIGN KEY (`sawyer_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `message` ADD CONSTRAINT `FK_11cb07b9ecf8cb247c5e2dc86ab` FOREIGN KEY (`thread_id`) REFERENCES `message_thread`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `message` ADD CONSTRAINT `FK_27675d1d5b9dbaabc0546aeb0a1` FOREIGN KEY (`author_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `saved_search` ADD CONSTRAINT `FK_e319e6a885a040b4fee7797cdb6` FOREIGN KEY (`account_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `saved_search_match` ADD CONSTRAINT `FK_cf5735669dd0ff8421346c92aba` FOREIGN KEY (`saved_search_id`) REFERENCES `saved_search`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `saved_search_match` ADD CONSTRAINT `FK_fd0c5e24bc53b3cde98d0131148` FOREIGN KEY (`listing_id`) REFERENCES `listing`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `saved_search_match` DROP FOREIGN KEY `FK_fd0c5e24bc53b3cde98d0131148`");
    await queryRunner.query("ALTER TABLE `saved_search_match` DROP FOREIGN KEY `FK_cf5735669dd0ff8421346c92aba`");
    await queryRunner.query("ALTER TABLE `saved_search` DROP FOREIGN KEY `FK_e319e6a885a040b4fee7797cdb6`");
    await queryRunner.query("ALTER TABLE `message` DROP FOREIGN KEY `FK_27675d1d5b9dbaabc0546aeb0a1`");
    await queryRunner.query("ALTER TABLE `message` DROP FOREIGN KEY `FK_11cb07b9ecf8cb247c5e2dc86ab`");
    await queryRunner.query("ALTER TABLE `message_thread` DROP FOREIGN KEY `FK_110b13043049d56cdd429d2b454`");
    await queryRunner.query("ALTER TABLE `message_thread` DROP FOREIGN KEY `FK_335ad509e73110868125436d401`");
    await queryRunner.query("ALTER TABLE `message_thread` DROP FOREIGN KEY `FK_96ddf47e44ee668b35d156f7ac8`");
    await queryRunner.query("ALTER TABLE `favourite` DROP FOREIGN KEY `FK_2e3ddca7ee4450e8bdefe3c8023`");
    await queryRunner.query("ALTER TABLE `favourite` DROP FOREIGN KEY `FK_d24582e3f008b9aa802318f96eb`");
    await queryRunner.query("DROP TABLE `saved_search_match`");
    await queryRunner.query("DROP TABLE `saved_search`");
    await queryRunner.query("DROP TABLE `message`");
    await queryRunner.query("DROP TABLE `message_thread`");
    await queryRunner.query("DROP TABLE `favourite`");
  }
}
