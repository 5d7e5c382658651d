-- Full-text index over each revision's title, summary and step text (FTS5), kept in sync by triggers.
CREATE VIRTUAL TABLE guide_search USING fts5(revision_id UNINDEXED, title, summary, steps_text, tokenize = 'porter unicode61');
--> statement-breakpoint
CREATE TRIGGER guide_search_revision_insert AFTER INSERT ON revisions BEGIN
  INSERT INTO guide_search (revision_id, title, summary, steps_text) VALUES (new.id, new.title, new.summary, '');
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_revision_update AFTER UPDATE OF title, summary ON revisions BEGIN
  UPDATE guide_search SET title = new.title, summary = new.summary WHERE revision_id = new.id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_revision_delete AFTER DELETE ON revisions BEGIN
  DELETE FROM guide_search WHERE revision_id = old.id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_step_insert AFTER INSERT ON steps BEGIN
  UPDATE guide_search SET steps_text = (
    SELECT group_concat(title || ' ' || body_text, ' ') FROM steps WHERE revision_id = new.revision_id
  ) WHERE revision_id = new.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_step_update AFTER UPDATE OF title, body_text ON steps BEGIN
  UPDATE guide_search SET steps_text = (
    SELECT group_concat(title || ' ' || body_text, ' ') FROM steps WHERE revision_id = new.revision_id
  ) WHERE revision_id = new.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_step_delete AFTER DELETE ON steps BEGIN
  UPDATE guide_search SET steps_text = coalesce((
    SELECT group_concat(title || ' ' || body_text, ' ') FROM steps WHERE revision_id = old.revision_id
  ), '') WHERE revision_id = old.revision_id;
END;
--> statement-breakpoint
-- Optimistic concurrency: a save names the version it edited and moves it on by exactly one;
-- anything else means somebody saved in between, and the whole batch rolls back.
CREATE TRIGGER revisions_version_step BEFORE UPDATE OF version ON revisions
WHEN new.version <> old.version + 1 BEGIN
  SELECT RAISE(ABORT, 'stale-version');
END;
--> statement-breakpoint
-- A submitted revision is a frozen snapshot: its content can no longer change.
CREATE TRIGGER revisions_frozen BEFORE UPDATE OF version, title, summary, category, difficulty, minutes ON revisions
WHEN old.state <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER steps_frozen_insert BEFORE INSERT ON steps
WHEN (SELECT state FROM revisions WHERE id = new.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER steps_frozen_update BEFORE UPDATE ON steps
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER steps_frozen_delete BEFORE DELETE ON steps
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER fitment_frozen_insert BEFORE INSERT ON fitment
WHEN (SELECT state FROM revisions WHERE id = new.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER fitment_frozen_delete BEFORE DELETE ON fitment
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER parts_frozen_insert BEFORE INSERT ON parts
WHEN (SELECT state FROM revisions WHERE id = new.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER parts_frozen_delete BEFORE DELETE ON parts
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER tools_frozen_insert BEFORE INSERT ON tools
WHEN (SELECT state FROM revisions WHERE id = new.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER tools_frozen_delete BEFORE DELETE ON tools
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER callouts_frozen_insert BEFORE INSERT ON callouts
WHEN (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = new.step_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER step_photos_frozen_insert BEFORE INSERT ON step_photos
WHEN (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = new.step_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
