CREATE TABLE `lab_sheet_photos` (
	`id` int AUTO_INCREMENT NOT NULL,
	`sheet_id` int NOT NULL,
	`storage_key` varchar(120) NOT NULL,
	`thumb_key` varchar(120) NOT NULL,
	`width` int NOT NULL,
	`height` int NOT NULL,
	`bytes` int NOT NULL,
	`caption` varchar(200) NOT NULL DEFAULT '',
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `lab_sheet_photos_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `lab_sheets` (
	`id` int AUTO_INCREMENT NOT NULL,
	`owner_id` int NOT NULL,
	`title` varchar(120) NOT NULL,
	`document` json NOT NULL,
	`measured` json NOT NULL,
	`supply_volts` decimal(10,2),
	`rescale` boolean NOT NULL DEFAULT false,
	`notes` text NOT NULL,
	`status` enum('draft','submitted','accepted','redo') NOT NULL DEFAULT 'draft',
	`class_id` int,
	`submitted_at` datetime(3),
	`review_comment` text,
	`reviewed_at` datetime(3),
	`version` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `lab_sheets_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `lab_sheet_photos` ADD CONSTRAINT `lab_sheet_photos_sheet_id_lab_sheets_id_fk` FOREIGN KEY (`sheet_id`) REFERENCES `lab_sheets`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `lab_sheets` ADD CONSTRAINT `lab_sheets_owner_id_users_id_fk` FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `lab_sheets` ADD CONSTRAINT `lab_sheets_class_id_classes_id_fk` FOREIGN KEY (`class_id`) REFERENCES `classes`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `lab_sheet_photos_sheet_idx` ON `lab_sheet_photos` (`sheet_id`);--> statement-breakpoint
CREATE INDEX `lab_sheets_owner_idx` ON `lab_sheets` (`owner_id`);--> statement-breakpoint
CREATE INDEX `lab_sheets_class_idx` ON `lab_sheets` (`class_id`,`status`);