ALTER TABLE `loop_revision` ADD `verification` json;--> statement-breakpoint
ALTER TABLE `loop_revision` ADD `engine_version` varchar(32);--> statement-breakpoint
ALTER TABLE `rail` ADD `verdict_flag` json;--> statement-breakpoint
ALTER TABLE `loop_revision` DROP COLUMN `metrics`;