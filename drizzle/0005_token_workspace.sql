ALTER TABLE `api_token` ADD `workspace_id` varchar(36);--> statement-breakpoint
ALTER TABLE `api_token` ADD CONSTRAINT `api_token_workspace_id_organization_id_fk` FOREIGN KEY (`workspace_id`) REFERENCES `organization`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `api_token_workspace_idx` ON `api_token` (`workspace_id`);