-- member_jobs gains the job's outcome (with its status, what "review waiting" asks): filled for
-- the rows already there, and the triggers that copy a job's columns now copy it too
-- (member_jobs_upkeep made them; each is replaced whole).
UPDATE `member_jobs` SET `outcome` = (SELECT `outcome` FROM `jobs` WHERE `jobs`.`id` = `member_jobs`.`job_id`);
--> statement-breakpoint
DROP TRIGGER IF EXISTS `member_jobs_job_added`;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_job_added` AFTER INSERT ON `jobs` BEGIN
  INSERT INTO `member_jobs` (`user_id`, `job_id`, `project_id`, `status`, `outcome`, `created_at`)
  SELECT `user_id`, NEW.`id`, NEW.`project_id`, NEW.`status`, NEW.`outcome`, NEW.`created_at` FROM `project_members` WHERE `project_id` = NEW.`project_id`;
END;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `member_jobs_job_status`;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_job_state` AFTER UPDATE OF `status`, `outcome` ON `jobs` BEGIN
  UPDATE `member_jobs` SET `status` = NEW.`status`, `outcome` = NEW.`outcome` WHERE `job_id` = NEW.`id`;
END;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `member_jobs_job_moved`;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_job_moved` AFTER UPDATE OF `id`, `project_id`, `created_at` ON `jobs` BEGIN
  DELETE FROM `member_jobs` WHERE `job_id` = OLD.`id`;
  INSERT INTO `member_jobs` (`user_id`, `job_id`, `project_id`, `status`, `outcome`, `created_at`)
  SELECT `user_id`, NEW.`id`, NEW.`project_id`, NEW.`status`, NEW.`outcome`, NEW.`created_at` FROM `project_members` WHERE `project_id` = NEW.`project_id`;
END;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `member_jobs_member_added`;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_member_added` AFTER INSERT ON `project_members` BEGIN
  INSERT INTO `member_jobs` (`user_id`, `job_id`, `project_id`, `status`, `outcome`, `created_at`)
  SELECT NEW.`user_id`, `id`, `project_id`, `status`, `outcome`, `created_at` FROM `jobs` WHERE `project_id` = NEW.`project_id`;
END;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `member_jobs_member_moved`;
--> statement-breakpoint
CREATE TRIGGER `member_jobs_member_moved` AFTER UPDATE OF `project_id`, `user_id` ON `project_members` BEGIN
  DELETE FROM `member_jobs` WHERE `user_id` = OLD.`user_id` AND `project_id` = OLD.`project_id`;
  INSERT INTO `member_jobs` (`user_id`, `job_id`, `project_id`, `status`, `outcome`, `created_at`)
  SELECT NEW.`user_id`, `id`, `project_id`, `status`, `outcome`, `created_at` FROM `jobs` WHERE `project_id` = NEW.`project_id`;
END;
