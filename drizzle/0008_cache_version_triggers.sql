-- companies.cache_version rises with every change to a company row or to its catalog items, in the
-- same transaction, whichever process or script makes it; app processes compare it with the
-- version of the company and catalog they keep in memory.
CREATE TRIGGER `companies_cache_version_on_update` AFTER UPDATE ON `companies` WHEN NEW.`cache_version` = OLD.`cache_version` BEGIN
  UPDATE `companies` SET `cache_version` = `cache_version` + 1 WHERE `id` = NEW.`id`;
END;
--> statement-breakpoint
CREATE TRIGGER `catalog_items_cache_version_on_insert` AFTER INSERT ON `catalog_items` BEGIN
  UPDATE `companies` SET `cache_version` = `cache_version` + 1 WHERE `id` = NEW.`company_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `catalog_items_cache_version_on_update` AFTER UPDATE ON `catalog_items` BEGIN
  UPDATE `companies` SET `cache_version` = `cache_version` + 1 WHERE `id` IN (OLD.`company_id`, NEW.`company_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `catalog_items_cache_version_on_delete` AFTER DELETE ON `catalog_items` BEGIN
  UPDATE `companies` SET `cache_version` = `cache_version` + 1 WHERE `id` = OLD.`company_id`;
END;
