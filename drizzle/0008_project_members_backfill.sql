-- Existing projects get their people as members: whoever created the project, uploaded a model
-- to it or submitted a job in it (issue 14). Accounts that no longer exist are skipped (the
-- foreign key would refuse them); running it twice adds nothing (OR IGNORE on the primary key).
INSERT OR IGNORE INTO `project_members` (`project_id`, `user_id`, `added_by`)
SELECT `id`, `created_by`, NULL FROM `projects`
WHERE `created_by` IS NOT NULL AND `created_by` IN (SELECT `id` FROM `user`);
--> statement-breakpoint
INSERT OR IGNORE INTO `project_members` (`project_id`, `user_id`, `added_by`)
SELECT DISTINCT `project_id`, `uploaded_by`, NULL FROM `models`
WHERE `uploaded_by` IS NOT NULL AND `uploaded_by` IN (SELECT `id` FROM `user`);
--> statement-breakpoint
INSERT OR IGNORE INTO `project_members` (`project_id`, `user_id`, `added_by`)
SELECT DISTINCT `project_id`, `submitted_by`, NULL FROM `jobs`
WHERE `submitted_by` IS NOT NULL AND `submitted_by` IN (SELECT `id` FROM `user`);
