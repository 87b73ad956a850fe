-- The audit trail and review decisions are append-only: refuse UPDATE and DELETE at the
-- database itself, so no code path (or hand-run query) can rewrite history.
CREATE TRIGGER `audit_log_no_update` BEFORE UPDATE ON `audit_log`
BEGIN SELECT RAISE(ABORT, 'audit_log is append-only: entries are never changed'); END;
--> statement-breakpoint
CREATE TRIGGER `audit_log_no_delete` BEFORE DELETE ON `audit_log`
BEGIN SELECT RAISE(ABORT, 'audit_log is append-only: entries are never deleted'); END;
--> statement-breakpoint
CREATE TRIGGER `reviews_no_update` BEFORE UPDATE ON `reviews`
BEGIN SELECT RAISE(ABORT, 'reviews are append-only: record a new decision instead of editing one'); END;
--> statement-breakpoint
CREATE TRIGGER `reviews_no_delete` BEFORE DELETE ON `reviews`
BEGIN SELECT RAISE(ABORT, 'reviews are append-only: decisions are never deleted'); END;
