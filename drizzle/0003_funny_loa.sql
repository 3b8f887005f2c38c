CREATE TABLE `rate_limit_bucket` (
	`bucket` varchar(100) NOT NULL,
	`hits` int NOT NULL,
	`resets_at` datetime(3) NOT NULL,
	CONSTRAINT `rate_limit_bucket_bucket` PRIMARY KEY(`bucket`)
);
--> statement-breakpoint
CREATE INDEX `rate_limit_bucket_resets_idx` ON `rate_limit_bucket` (`resets_at`);