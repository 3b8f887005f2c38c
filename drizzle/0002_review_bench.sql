CREATE TABLE `bench_file` (
	`id` varchar(36) NOT NULL,
	`workspace_id` varchar(36) NOT NULL,
	`rail_id` varchar(36) NOT NULL,
	`file_name` varchar(255) NOT NULL,
	`kind` enum('loop','plant') NOT NULL,
	`metadata` json NOT NULL,
	`series` json NOT NULL,
	`format` json NOT NULL,
	`parse_notes` json NOT NULL,
	`points` int NOT NULL,
	`size_bytes` int NOT NULL,
	`uploaded_by` varchar(36),
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `bench_file_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `review_request` (
	`id` varchar(36) NOT NULL,
	`workspace_id` varchar(36) NOT NULL,
	`loop_id` varchar(36) NOT NULL,
	`reviewer_id` varchar(36) NOT NULL,
	`requested_by` varchar(36),
	`status` enum('pending','approved','changes-requested','superseded') NOT NULL DEFAULT 'pending',
	`note` text,
	`created_at` datetime(3) NOT NULL,
	`decided_at` datetime(3),
	CONSTRAINT `review_request_id` PRIMARY KEY(`id`),
	CONSTRAINT `review_request_loop_reviewer_uq` UNIQUE(`loop_id`,`reviewer_id`)
);
--> statement-breakpoint
ALTER TABLE `loop_comment` ADD `freq_hz` double;--> statement-breakpoint
ALTER TABLE `loop_revision` ADD `template_id` varchar(36);--> statement-breakpoint
ALTER TABLE `bench_file` ADD CONSTRAINT `bench_file_workspace_id_organization_id_fk` FOREIGN KEY (`workspace_id`) REFERENCES `organization`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `bench_file` ADD CONSTRAINT `bench_file_rail_id_rail_id_fk` FOREIGN KEY (`rail_id`) REFERENCES `rail`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `bench_file` ADD CONSTRAINT `bench_file_uploaded_by_user_id_fk` FOREIGN KEY (`uploaded_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `review_request` ADD CONSTRAINT `review_request_workspace_id_organization_id_fk` FOREIGN KEY (`workspace_id`) REFERENCES `organization`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `review_request` ADD CONSTRAINT `review_request_loop_id_loop_revision_id_fk` FOREIGN KEY (`loop_id`) REFERENCES `loop_revision`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `review_request` ADD CONSTRAINT `review_request_reviewer_id_user_id_fk` FOREIGN KEY (`reviewer_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `review_request` ADD CONSTRAINT `review_request_requested_by_user_id_fk` FOREIGN KEY (`requested_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `bench_file_rail_idx` ON `bench_file` (`rail_id`);--> statement-breakpoint
CREATE INDEX `review_request_reviewer_idx` ON `review_request` (`reviewer_id`,`status`);--> statement-breakpoint
ALTER TABLE `loop_revision` ADD CONSTRAINT `loop_revision_template_id_template_id_fk` FOREIGN KEY (`template_id`) REFERENCES `template`(`id`) ON DELETE set null ON UPDATE no action;