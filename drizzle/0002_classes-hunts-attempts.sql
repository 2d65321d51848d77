CREATE TABLE `attempt_probes` (
	`id` int AUTO_INCREMENT NOT NULL,
	`attempt_id` int NOT NULL,
	`from_terminal` varchar(70) NOT NULL,
	`to_terminal` varchar(70) NOT NULL,
	`volts` decimal(14,4) NOT NULL,
	`degrees` decimal(7,2) NOT NULL,
	`energized` boolean NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `attempt_probes_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `attempts` (
	`id` int AUTO_INCREMENT NOT NULL,
	`hunt_id` int NOT NULL,
	`student_id` int NOT NULL,
	`status` enum('in-progress','submitted') NOT NULL DEFAULT 'in-progress',
	`document` json NOT NULL,
	`probes_used` int NOT NULL DEFAULT 0,
	`unsafe_closures` int NOT NULL DEFAULT 0,
	`live_rewires` int NOT NULL DEFAULT 0,
	`operations` int NOT NULL DEFAULT 0,
	`live_wiring` char(64),
	`diagnosis` json,
	`correct` boolean,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`last_activity_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`submitted_at` datetime(3),
	CONSTRAINT `attempts_id` PRIMARY KEY(`id`),
	CONSTRAINT `attempts_hunt_student_unique` UNIQUE(`hunt_id`,`student_id`)
);
--> statement-breakpoint
CREATE TABLE `class_invitations` (
	`id` int AUTO_INCREMENT NOT NULL,
	`class_id` int NOT NULL,
	`email` varchar(254) NOT NULL,
	`token_hash` char(64) NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`used_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `class_invitations_id` PRIMARY KEY(`id`),
	CONSTRAINT `class_invitations_token_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `class_members` (
	`class_id` int NOT NULL,
	`user_id` int NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `class_members_class_id_user_id_pk` PRIMARY KEY(`class_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `classes` (
	`id` int AUTO_INCREMENT NOT NULL,
	`instructor_id` int NOT NULL,
	`name` varchar(120) NOT NULL,
	`term` varchar(60) NOT NULL DEFAULT '',
	`tolerance_percent` decimal(4,1) NOT NULL DEFAULT 5,
	`join_code` char(8) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `classes_id` PRIMARY KEY(`id`),
	CONSTRAINT `classes_join_code_unique` UNIQUE(`join_code`)
);
--> statement-breakpoint
CREATE TABLE `hunt_classes` (
	`hunt_id` int NOT NULL,
	`class_id` int NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `hunt_classes_hunt_id_class_id_pk` PRIMARY KEY(`hunt_id`,`class_id`)
);
--> statement-breakpoint
CREATE TABLE `hunts` (
	`id` int AUTO_INCREMENT NOT NULL,
	`author_id` int NOT NULL,
	`title` varchar(120) NOT NULL,
	`instructions` text NOT NULL,
	`document` json NOT NULL,
	`faults` json NOT NULL,
	`secondary_prewired` boolean NOT NULL DEFAULT true,
	`due_at` datetime(3),
	`probe_budget` int,
	`feedback` enum('on-submit','after-due') NOT NULL DEFAULT 'on-submit',
	`published_at` datetime(3),
	`deleted_at` datetime(3),
	`version` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `hunts_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `probe_limits` (
	`key` varchar(255) NOT NULL,
	`points` int NOT NULL DEFAULT 0,
	`expire` bigint unsigned,
	CONSTRAINT `probe_limits_key` PRIMARY KEY(`key`)
);
--> statement-breakpoint
ALTER TABLE `attempt_probes` ADD CONSTRAINT `attempt_probes_attempt_id_attempts_id_fk` FOREIGN KEY (`attempt_id`) REFERENCES `attempts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `attempts` ADD CONSTRAINT `attempts_hunt_id_hunts_id_fk` FOREIGN KEY (`hunt_id`) REFERENCES `hunts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `attempts` ADD CONSTRAINT `attempts_student_id_users_id_fk` FOREIGN KEY (`student_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `class_invitations` ADD CONSTRAINT `class_invitations_class_id_classes_id_fk` FOREIGN KEY (`class_id`) REFERENCES `classes`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `class_members` ADD CONSTRAINT `class_members_class_id_classes_id_fk` FOREIGN KEY (`class_id`) REFERENCES `classes`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `class_members` ADD CONSTRAINT `class_members_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `classes` ADD CONSTRAINT `classes_instructor_id_users_id_fk` FOREIGN KEY (`instructor_id`) REFERENCES `users`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `hunt_classes` ADD CONSTRAINT `hunt_classes_hunt_id_hunts_id_fk` FOREIGN KEY (`hunt_id`) REFERENCES `hunts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `hunt_classes` ADD CONSTRAINT `hunt_classes_class_id_classes_id_fk` FOREIGN KEY (`class_id`) REFERENCES `classes`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `hunts` ADD CONSTRAINT `hunts_author_id_users_id_fk` FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `attempt_probes_attempt_idx` ON `attempt_probes` (`attempt_id`);--> statement-breakpoint
CREATE INDEX `attempts_student_idx` ON `attempts` (`student_id`);--> statement-breakpoint
CREATE INDEX `class_members_user_idx` ON `class_members` (`user_id`);--> statement-breakpoint
CREATE INDEX `classes_instructor_idx` ON `classes` (`instructor_id`);--> statement-breakpoint
CREATE INDEX `hunt_classes_class_idx` ON `hunt_classes` (`class_id`);--> statement-breakpoint
CREATE INDEX `hunts_author_idx` ON `hunts` (`author_id`,`deleted_at`);