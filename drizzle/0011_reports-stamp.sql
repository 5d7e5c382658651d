-- A third stamp, raised on every change to readers' fitment reports: the guide page's tally and
-- reports, and the Library's "most reported fits" order, are kept by it instead of being counted
-- on every request.
INSERT INTO content_stamps (name, stamp) VALUES ('reports', 0);
--> statement-breakpoint
CREATE TRIGGER content_stamp_fitment_reports_insert AFTER INSERT ON fitment_reports BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'reports';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_fitment_reports_update AFTER UPDATE ON fitment_reports BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'reports';
END;
--> statement-breakpoint
CREATE TRIGGER content_stamp_fitment_reports_delete AFTER DELETE ON fitment_reports BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'reports';
END;
--> statement-breakpoint
-- The guide page shows its author's bio as well as their name: a change to either is a change to guides.
DROP TRIGGER content_stamp_users_name;
--> statement-breakpoint
CREATE TRIGGER content_stamp_users_name AFTER UPDATE OF name, bio ON users BEGIN
  UPDATE content_stamps SET stamp = stamp + 1 WHERE name = 'guides';
END;
