CREATE TABLE `captured_mail` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`organisation_id` integer,
	`outbox_id` integer,
	`message_id` text,
	`from_address` text NOT NULL,
	`to_addresses` text NOT NULL,
	`subject` text NOT NULL,
	`text_body` text,
	`html_body` text,
	`size_bytes` integer NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`outbox_id`) REFERENCES `email_outbox`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `captured_mail_org` ON `captured_mail` (`organisation_id`,`id`);--> statement-breakpoint
CREATE INDEX `captured_mail_to` ON `captured_mail` (`to_addresses`);--> statement-breakpoint
ALTER TABLE `email_outbox` ADD `next_attempt_at` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `email_outbox` ADD `lease_owner` text;--> statement-breakpoint
ALTER TABLE `email_outbox` ADD `lease_expires_at` integer;--> statement-breakpoint
CREATE INDEX `email_outbox_due` ON `email_outbox` (`status`,`next_attempt_at`);