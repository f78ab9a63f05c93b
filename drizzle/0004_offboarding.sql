ALTER TABLE `api_tokens` ADD `expires_at` timestamp(3);--> statement-breakpoint
ALTER TABLE `users` ADD `deactivated_at` timestamp(3);