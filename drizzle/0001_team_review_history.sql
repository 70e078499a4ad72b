ALTER TABLE `reviews` ADD `round` text;--> statement-breakpoint
ALTER TABLE `reviews` ADD `decided_revision_id` text REFERENCES revisions(id);--> statement-breakpoint
ALTER TABLE `reviews` ADD `closed_at` integer;--> statement-breakpoint
ALTER TABLE `reviews` ADD `closed_reason` text;--> statement-breakpoint
ALTER TABLE `revisions` ADD `updated_at` integer;--> statement-breakpoint
ALTER TABLE `revisions` ADD `saves` integer DEFAULT 1 NOT NULL;