CREATE TABLE `seed_mark` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(64) NOT NULL,
	`applied_at` datetime(3) NOT NULL,
	CONSTRAINT `seed_mark_id` PRIMARY KEY(`id`),
	CONSTRAINT `seed_mark_name_unique` UNIQUE(`name`)
);
