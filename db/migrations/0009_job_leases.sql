CREATE TABLE `job_leases` (
	`name` varchar(60) NOT NULL,
	`holder` varchar(120) NOT NULL,
	`expires_at` timestamp(3) NOT NULL,
	CONSTRAINT `job_leases_name` PRIMARY KEY(`name`)
);
