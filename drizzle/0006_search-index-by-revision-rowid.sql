-- The full-text index's rows are found by the revision they index. Its key was revision_id, an
-- UNINDEXED column of the FTS5 table, so every lookup (each trigger below, and the Library's join
-- of a search to published guides) read the whole index. Here the row's own rowid is the revision
-- id: a lookup by rowid is a B-tree seek. Same columns and contents as before, less revision_id;
-- the view guide_search_text (0004) still says what each column holds.
DROP TRIGGER IF EXISTS guide_search_revision_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_revision_update;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_revision_delete;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_step_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_step_update;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_step_delete;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_part_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_part_update;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_part_delete;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_tool_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_tool_update;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_tool_delete;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_callout_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_callout_update;
--> statement-breakpoint
DROP TRIGGER IF EXISTS guide_search_callout_delete;
--> statement-breakpoint
DROP TABLE IF EXISTS guide_search;
--> statement-breakpoint
CREATE VIRTUAL TABLE guide_search USING fts5(
  title, summary, steps_text, parts_text, tools_text, callouts_text,
  tokenize = 'porter unicode61'
);
--> statement-breakpoint
-- Every revision that already exists, in one pass.
INSERT INTO guide_search (rowid, title, summary, steps_text, parts_text, tools_text, callouts_text)
SELECT revision_id, title, summary, steps_text, parts_text, tools_text, callouts_text FROM guide_search_text;
--> statement-breakpoint
CREATE TRIGGER guide_search_revision_insert AFTER INSERT ON revisions BEGIN
  INSERT INTO guide_search (rowid, title, summary, steps_text, parts_text, tools_text, callouts_text)
  SELECT revision_id, title, summary, steps_text, parts_text, tools_text, callouts_text
  FROM guide_search_text WHERE revision_id = new.id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_revision_update AFTER UPDATE OF title, summary ON revisions BEGIN
  UPDATE guide_search SET title = new.title, summary = new.summary WHERE rowid = new.id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_revision_delete AFTER DELETE ON revisions BEGIN
  DELETE FROM guide_search WHERE rowid = old.id;
END;
--> statement-breakpoint
-- Steps carry the callouts, so a step's change refreshes both columns.
CREATE TRIGGER guide_search_step_insert AFTER INSERT ON steps BEGIN
  UPDATE guide_search SET
    steps_text = (SELECT steps_text FROM guide_search_text WHERE revision_id = new.revision_id),
    callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = new.revision_id)
  WHERE rowid = new.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_step_update AFTER UPDATE ON steps BEGIN
  UPDATE guide_search SET
    steps_text = (SELECT steps_text FROM guide_search_text WHERE revision_id = guide_search.rowid),
    callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = guide_search.rowid)
  WHERE rowid IN (old.revision_id, new.revision_id);
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_step_delete AFTER DELETE ON steps BEGIN
  UPDATE guide_search SET
    steps_text = (SELECT steps_text FROM guide_search_text WHERE revision_id = old.revision_id),
    callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = old.revision_id)
  WHERE rowid = old.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_part_insert AFTER INSERT ON parts BEGIN
  UPDATE guide_search SET parts_text = (SELECT parts_text FROM guide_search_text WHERE revision_id = new.revision_id)
  WHERE rowid = new.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_part_update AFTER UPDATE ON parts BEGIN
  UPDATE guide_search SET parts_text = (SELECT parts_text FROM guide_search_text WHERE revision_id = guide_search.rowid)
  WHERE rowid IN (old.revision_id, new.revision_id);
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_part_delete AFTER DELETE ON parts BEGIN
  UPDATE guide_search SET parts_text = (SELECT parts_text FROM guide_search_text WHERE revision_id = old.revision_id)
  WHERE rowid = old.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_tool_insert AFTER INSERT ON tools BEGIN
  UPDATE guide_search SET tools_text = (SELECT tools_text FROM guide_search_text WHERE revision_id = new.revision_id)
  WHERE rowid = new.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_tool_update AFTER UPDATE ON tools BEGIN
  UPDATE guide_search SET tools_text = (SELECT tools_text FROM guide_search_text WHERE revision_id = guide_search.rowid)
  WHERE rowid IN (old.revision_id, new.revision_id);
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_tool_delete AFTER DELETE ON tools BEGIN
  UPDATE guide_search SET tools_text = (SELECT tools_text FROM guide_search_text WHERE revision_id = old.revision_id)
  WHERE rowid = old.revision_id;
END;
--> statement-breakpoint
-- A callout reaches its revision through its step; one whose step is already gone (a cascade) has
-- no revision left to refresh, and the step's own trigger has refreshed it.
CREATE TRIGGER guide_search_callout_insert AFTER INSERT ON callouts BEGIN
  UPDATE guide_search SET callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = guide_search.rowid)
  WHERE rowid = (SELECT revision_id FROM steps WHERE id = new.step_id);
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_callout_update AFTER UPDATE ON callouts BEGIN
  UPDATE guide_search SET callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = guide_search.rowid)
  WHERE rowid IN (SELECT revision_id FROM steps WHERE id IN (old.step_id, new.step_id));
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_callout_delete AFTER DELETE ON callouts BEGIN
  UPDATE guide_search SET callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = guide_search.rowid)
  WHERE rowid = (SELECT revision_id FROM steps WHERE id = old.step_id);
END;
