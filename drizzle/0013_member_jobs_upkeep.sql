-- member_jobs mirrors project_members × jobs (app/db/tables/member-jobs.ts): these triggers keep
-- it so inside every write's own transaction, whoever writes (the app, the worker, the seed, a
-- hand-run statement), and the backfill at the end fills it for the jobs already there.
CREATE TRIGGER `member_jobs_job_added` AFTER INSERT ON `jobs` BEGIN
  INSERT INTO `member_jobs` (`user_id`, `job_id`, `project_id`, `status`, `created_at`)
  SELECT `user_id`, NEW.`id`, NEW.`project_id`, NEW.`status`, NEW.`created_at` FROM `project_members` WHERE `project_id` = NEW.`project_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_job_status` AFTER UPDATE OF `status` ON `jobs` BEGIN
  UPDATE `member_jobs` SET `status` = NEW.`status` WHERE `job_id` = NEW.`id`;
END;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_job_moved` AFTER UPDATE OF `id`, `project_id`, `created_at` ON `jobs` BEGIN
  DELETE FROM `member_jobs` WHERE `job_id` = OLD.`id`;
  INSERT INTO `member_jobs` (`user_id`, `job_id`, `project_id`, `status`, `created_at`)
  SELECT `user_id`, NEW.`id`, NEW.`project_id`, NEW.`status`, NEW.`created_at` FROM `project_members` WHERE `project_id` = NEW.`project_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_job_removed` AFTER DELETE ON `jobs` BEGIN
  DELETE FROM `member_jobs` WHERE `job_id` = OLD.`id`;
END;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_member_added` AFTER INSERT ON `project_members` BEGIN
  INSERT INTO `member_jobs` (`user_id`, `job_id`, `project_id`, `status`, `created_at`)
  SELECT NEW.`user_id`, `id`, `project_id`, `status`, `created_at` FROM `jobs` WHERE `project_id` = NEW.`project_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_member_removed` AFTER DELETE ON `project_members` BEGIN
  DELETE FROM `member_jobs` WHERE `user_id` = OLD.`user_id` AND `project_id` = OLD.`project_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_member_moved` AFTER UPDATE OF `project_id`, `user_id` ON `project_members` BEGIN
  DELETE FROM `member_jobs` WHERE `user_id` = OLD.`user_id` AND `project_id` = OLD.`project_id`;
  INSERT INTO `member_jobs` (`user_id`, `job_id`, `project_id`, `status`, `created_at`)
  SELECT NEW.`user_id`, `id`, `project_id`, `status`, `created_at` FROM `jobs` WHERE `project_id` = NEW.`project_id`;
END;
--> statement-breakpoint
INSERT OR IGNORE INTO `member_jobs` (`user_id`, `job_id`, `project_id`, `status`, `created_at`)
SELECT m.`user_id`, j.`id`, j.`project_id`, j.`status`, j.`created_at` FROM `project_members` m JOIN `jobs` j ON j.`project_id` = m.`project_id`;
