-- Every model stored before versions existed becomes its own version 1, pointing at the file
-- it was uploaded with; jobs queued before ran that version.
INSERT INTO `model_versions` (`id`, `model_id`, `version`, `name`, `file_name`, `file_key`, `sha256`, `size_bytes`,
  `dimension`, `node_count`, `member_count`, `has_design`, `summary`, `warnings`, `note`, `created_by`, `created_at`)
SELECT `id` || ':v1', `id`, 1, `name`, `file_name`, `file_key`, `sha256`, `size_bytes`,
  `dimension`, `node_count`, `member_count`, `has_design`, `summary`, `warnings`, NULL, `uploaded_by`, `created_at`
FROM `models`
WHERE NOT EXISTS (SELECT 1 FROM `model_versions` v WHERE v.`model_id` = `models`.`id`);
--> statement-breakpoint
UPDATE `jobs` SET `model_version` = 1 WHERE `model_version` IS NULL;
--> statement-breakpoint
-- Versions are immutable: a change is a new version, never an edit of an old one.
CREATE TRIGGER `model_versions_no_update` BEFORE UPDATE ON `model_versions`
BEGIN SELECT RAISE(ABORT, 'model versions are immutable: save a new version instead'); END;
--> statement-breakpoint
CREATE TRIGGER `model_versions_no_delete` BEFORE DELETE ON `model_versions`
BEGIN SELECT RAISE(ABORT, 'model versions are never deleted'); END;
