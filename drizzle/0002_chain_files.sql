CREATE TABLE `chain_files` (
	`id` text PRIMARY KEY NOT NULL,
	`chain_id` text NOT NULL,
	`kind` text NOT NULL,
	`name` text NOT NULL,
	`storage_key` text NOT NULL,
	`size` integer NOT NULL,
	`sha256` text NOT NULL,
	`rows` integer NOT NULL,
	`sample_rate` real,
	`created_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`chain_id`) REFERENCES `chains`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `chain_files_storage_key_unique` ON `chain_files` (`storage_key`);--> statement-breakpoint
CREATE INDEX `chain_files_chain_idx` ON `chain_files` (`chain_id`);