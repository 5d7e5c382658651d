CREATE TABLE `content_stamps` (
	`name` text PRIMARY KEY NOT NULL,
	`stamp` integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
-- Raised on every change to what readers' pages are built from; caches compare the stamp, not the content.
INSERT INTO content_stamps (name, stamp) VALUES ('catalogue', 0), ('guides', 0);
--> statement-breakpoint
CREATE TRIGGER content_stamp_makes_insert AFTER INSERT ON makes BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_makes_update AFTER UPDATE ON makes BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_makes_delete AFTER DELETE ON makes BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_models_insert AFTER INSERT ON models BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_models_update AFTER UPDATE ON models BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_models_delete AFTER DELETE ON models BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_generations_insert AFTER INSERT ON generations BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_generations_update AFTER UPDATE ON generations BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_generations_delete AFTER DELETE ON generations BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_variants_insert AFTER INSERT ON variants BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_variants_update AFTER UPDATE ON variants BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_variants_delete AFTER DELETE ON variants BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'catalogue';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_guides_insert AFTER INSERT ON guides BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'guides';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_guides_update AFTER UPDATE ON guides BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'guides';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_guides_delete AFTER DELETE ON guides BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'guides';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_users_name AFTER UPDATE OF name ON users BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'guides';
END;
