-- The Library's search also finds what a guide's page shows beside its steps: the parts list (name,
-- part number, notes), the tools and the callouts' own words (caution and tip text, the fastener and
-- threadlocker of a torque callout, a circuit's label and the signal word).
-- An FTS5 table cannot gain columns, so guide_search is made again with three more, filled from one
-- view that says what each column holds; every trigger refreshes its revision's row from that view.
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
DROP TABLE IF EXISTS guide_search;
--> statement-breakpoint
CREATE VIEW guide_search_text AS
SELECT
  r.id AS revision_id,
  r.title AS title,
  r.summary AS summary,
  coalesce((SELECT group_concat(s.title || ' ' || s.body_text, ' ') FROM steps s WHERE s.revision_id = r.id), '') AS steps_text,
  coalesce((
    SELECT group_concat(p.name || ' ' || coalesce(p.part_number, '') || ' ' || coalesce(p.notes, ''), ' ')
    FROM parts p WHERE p.revision_id = r.id
  ), '') AS parts_text,
  coalesce((SELECT group_concat(t.name, ' ') FROM tools t WHERE t.revision_id = r.id), '') AS tools_text,
  coalesce((
    SELECT group_concat(
      CASE WHEN json_valid(c.data) THEN
        coalesce(json_extract(c.data, '$.signalWord'), '') || ' ' || coalesce(json_extract(c.data, '$.text'), '') || ' '
        || coalesce(json_extract(c.data, '$.fastener'), '') || ' ' || coalesce(json_extract(c.data, '$.size'), '') || ' '
        || coalesce(json_extract(c.data, '$.threadlocker'), '') || ' ' || coalesce(json_extract(c.data, '$.label'), '')
      ELSE '' END, ' ')
    FROM callouts c JOIN steps s ON s.id = c.step_id WHERE s.revision_id = r.id
  ), '') AS callouts_text
FROM revisions r;
--> statement-breakpoint
CREATE VIRTUAL TABLE guide_search USING fts5(
  revision_id UNINDEXED, title, summary, steps_text, parts_text, tools_text, callouts_text,
  tokenize = 'porter unicode61'
);
--> statement-breakpoint
-- Every revision that already exists, in one pass.
INSERT INTO guide_search (revision_id, title, summary, steps_text, parts_text, tools_text, callouts_text)
SELECT revision_id, title, summary, steps_text, parts_text, tools_text, callouts_text FROM guide_search_text;
--> statement-breakpoint
CREATE TRIGGER guide_search_revision_insert AFTER INSERT ON revisions BEGIN
  INSERT INTO guide_search (revision_id, title, summary, steps_text, parts_text, tools_text, callouts_text)
  SELECT revision_id, title, summary, steps_text, parts_text, tools_text, callouts_text
  FROM guide_search_text WHERE revision_id = new.id;
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
-- Steps carry the callouts, so a step's change refreshes both columns.
CREATE TRIGGER guide_search_step_insert AFTER INSERT ON steps BEGIN
  UPDATE guide_search SET
    steps_text = (SELECT steps_text FROM guide_search_text WHERE revision_id = new.revision_id),
    callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = new.revision_id)
  WHERE revision_id = new.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_step_update AFTER UPDATE ON steps BEGIN
  UPDATE guide_search SET
    steps_text = (SELECT steps_text FROM guide_search_text WHERE revision_id = guide_search.revision_id),
    callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = guide_search.revision_id)
  WHERE revision_id IN (old.revision_id, new.revision_id);
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_step_delete AFTER DELETE ON steps BEGIN
  UPDATE guide_search SET
    steps_text = (SELECT steps_text FROM guide_search_text WHERE revision_id = old.revision_id),
    callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = old.revision_id)
  WHERE revision_id = old.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_part_insert AFTER INSERT ON parts BEGIN
  UPDATE guide_search SET parts_text = (SELECT parts_text FROM guide_search_text WHERE revision_id = new.revision_id)
  WHERE revision_id = new.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_part_update AFTER UPDATE ON parts BEGIN
  UPDATE guide_search SET parts_text = (SELECT parts_text FROM guide_search_text WHERE revision_id = guide_search.revision_id)
  WHERE revision_id IN (old.revision_id, new.revision_id);
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_part_delete AFTER DELETE ON parts BEGIN
  UPDATE guide_search SET parts_text = (SELECT parts_text FROM guide_search_text WHERE revision_id = old.revision_id)
  WHERE revision_id = old.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_tool_insert AFTER INSERT ON tools BEGIN
  UPDATE guide_search SET tools_text = (SELECT tools_text FROM guide_search_text WHERE revision_id = new.revision_id)
  WHERE revision_id = new.revision_id;
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_tool_update AFTER UPDATE ON tools BEGIN
  UPDATE guide_search SET tools_text = (SELECT tools_text FROM guide_search_text WHERE revision_id = guide_search.revision_id)
  WHERE revision_id IN (old.revision_id, new.revision_id);
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_tool_delete AFTER DELETE ON tools BEGIN
  UPDATE guide_search SET tools_text = (SELECT tools_text FROM guide_search_text WHERE revision_id = old.revision_id)
  WHERE revision_id = old.revision_id;
END;
--> statement-breakpoint
-- A callout reaches its revision through its step; one whose step is already gone (a cascade) has
-- no revision left to refresh, and the step's own trigger has refreshed it.
CREATE TRIGGER guide_search_callout_insert AFTER INSERT ON callouts BEGIN
  UPDATE guide_search SET callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = guide_search.revision_id)
  WHERE revision_id = (SELECT revision_id FROM steps WHERE id = new.step_id);
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_callout_update AFTER UPDATE ON callouts BEGIN
  UPDATE guide_search SET callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = guide_search.revision_id)
  WHERE revision_id IN (SELECT revision_id FROM steps WHERE id IN (old.step_id, new.step_id));
END;
--> statement-breakpoint
CREATE TRIGGER guide_search_callout_delete AFTER DELETE ON callouts BEGIN
  UPDATE guide_search SET callouts_text = (SELECT callouts_text FROM guide_search_text WHERE revision_id = guide_search.revision_id)
  WHERE revision_id = (SELECT revision_id FROM steps WHERE id = old.step_id);
END;
