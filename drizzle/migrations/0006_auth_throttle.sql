CREATE TABLE `auth_throttle` (
	`bucket` varchar(320) NOT NULL,
	`attempts` int NOT NULL,
	`window_ends_at` datetime(3) NOT NULL,
	CONSTRAINT `auth_throttle_bucket` PRIMARY KEY(`bucket`)
);
