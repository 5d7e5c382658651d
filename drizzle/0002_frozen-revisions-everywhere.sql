-- A submitted revision is a frozen snapshot, enforced here for every table that holds its content.
-- Every child table (steps, callouts, step_photos, fitment, parts, tools) refuses INSERT, UPDATE and
-- DELETE while the revision it belongs to is not a draft; an UPDATE is checked against both the
-- old and the new parent, so a row cannot be moved into or out of a frozen revision either.
-- The revisions row itself is born a draft, and once submitted it accepts only the review
-- transitions below. Findings and caution sign-offs are the review's own records and stay writable.
-- The old partial set from 0001 is dropped and replaced by the complete one under the same names.
DROP TRIGGER IF EXISTS revisions_frozen;
--> statement-breakpoint
DROP TRIGGER IF EXISTS steps_frozen_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS steps_frozen_update;
--> statement-breakpoint
DROP TRIGGER IF EXISTS steps_frozen_delete;
--> statement-breakpoint
DROP TRIGGER IF EXISTS fitment_frozen_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS fitment_frozen_delete;
--> statement-breakpoint
DROP TRIGGER IF EXISTS parts_frozen_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS parts_frozen_delete;
--> statement-breakpoint
DROP TRIGGER IF EXISTS tools_frozen_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS tools_frozen_delete;
--> statement-breakpoint
DROP TRIGGER IF EXISTS callouts_frozen_insert;
--> statement-breakpoint
DROP TRIGGER IF EXISTS step_photos_frozen_insert;
--> statement-breakpoint
-- A revision starts as a draft with no review bookkeeping; it reaches the other states only by the
-- transitions allowed below.
CREATE TRIGGER revisions_frozen_insert BEFORE INSERT ON revisions
WHEN new.state <> 'draft' OR new.submitted_at IS NOT NULL OR new.reviewed_at IS NOT NULL
  OR new.reviewed_by_id IS NOT NULL OR new.published_at IS NOT NULL BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
-- A draft's content is free to change; its identity is not, it may leave the draft state only by
-- being submitted (which stamps submitted_at and the change summary), and it carries no review
-- bookkeeping.
CREATE TRIGGER revisions_draft_update BEFORE UPDATE ON revisions
WHEN old.state = 'draft' AND NOT (
  new.id IS old.id AND new.guide_id IS old.guide_id AND new.number IS old.number
  AND new.created_by_id IS old.created_by_id AND new.created_at IS old.created_at
  AND new.reviewed_at IS old.reviewed_at AND new.reviewed_by_id IS old.reviewed_by_id
  AND new.published_at IS old.published_at
  AND (
    (new.state = 'draft' AND new.submitted_at IS old.submitted_at AND new.change_summary IS old.change_summary)
    OR (new.state = 'in-review' AND new.submitted_at IS NOT NULL
      AND new.version IS old.version AND new.title IS old.title AND new.summary IS old.summary
      AND new.category IS old.category AND new.difficulty IS old.difficulty AND new.minutes IS old.minutes)
  )
) BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
-- A submitted revision accepts exactly three changes, each with only the bookkeeping it sets:
--   in-review → changes-requested  (reviewed_at, reviewed_by_id)
--   in-review → published          (reviewed_at, reviewed_by_id, published_at)
--   published → superseded         (nothing else)
-- updated_at moves with each of them. Anything else, a no-op included, is refused.
CREATE TRIGGER revisions_frozen_update BEFORE UPDATE ON revisions
WHEN old.state <> 'draft' AND NOT (
  new.id IS old.id AND new.guide_id IS old.guide_id AND new.number IS old.number
  AND new.version IS old.version AND new.title IS old.title AND new.summary IS old.summary
  AND new.category IS old.category AND new.difficulty IS old.difficulty AND new.minutes IS old.minutes
  AND new.change_summary IS old.change_summary AND new.created_by_id IS old.created_by_id
  AND new.submitted_at IS old.submitted_at AND new.created_at IS old.created_at
  AND (
    (old.state = 'in-review' AND new.state = 'changes-requested'
      AND new.reviewed_at IS NOT NULL AND new.reviewed_by_id IS NOT NULL AND new.published_at IS old.published_at)
    OR (old.state = 'in-review' AND new.state = 'published'
      AND new.reviewed_at IS NOT NULL AND new.reviewed_by_id IS NOT NULL AND new.published_at IS NOT NULL)
    OR (old.state = 'published' AND new.state = 'superseded'
      AND new.reviewed_at IS old.reviewed_at AND new.reviewed_by_id IS old.reviewed_by_id
      AND new.published_at IS old.published_at)
  )
) BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
-- Only a draft can be thrown away; a submitted revision is the record of what an editor reviewed.
CREATE TRIGGER revisions_frozen_delete BEFORE DELETE ON revisions
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
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft'
  OR (SELECT state FROM revisions WHERE id = new.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER steps_frozen_delete BEFORE DELETE ON steps
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER callouts_frozen_insert BEFORE INSERT ON callouts
WHEN (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = new.step_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER callouts_frozen_update BEFORE UPDATE ON callouts
WHEN (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = old.step_id) <> 'draft'
  OR (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = new.step_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER callouts_frozen_delete BEFORE DELETE ON callouts
WHEN (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = old.step_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER step_photos_frozen_insert BEFORE INSERT ON step_photos
WHEN (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = new.step_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER step_photos_frozen_update BEFORE UPDATE ON step_photos
WHEN (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = old.step_id) <> 'draft'
  OR (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = new.step_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER step_photos_frozen_delete BEFORE DELETE ON step_photos
WHEN (SELECT r.state FROM steps s JOIN revisions r ON r.id = s.revision_id WHERE s.id = old.step_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER fitment_frozen_insert BEFORE INSERT ON fitment
WHEN (SELECT state FROM revisions WHERE id = new.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER fitment_frozen_update BEFORE UPDATE ON fitment
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft'
  OR (SELECT state FROM revisions WHERE id = new.revision_id) <> 'draft' BEGIN
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
CREATE TRIGGER parts_frozen_update BEFORE UPDATE ON parts
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft'
  OR (SELECT state FROM revisions WHERE id = new.revision_id) <> 'draft' BEGIN
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
CREATE TRIGGER tools_frozen_update BEFORE UPDATE ON tools
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft'
  OR (SELECT state FROM revisions WHERE id = new.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
--> statement-breakpoint
CREATE TRIGGER tools_frozen_delete BEFORE DELETE ON tools
WHEN (SELECT state FROM revisions WHERE id = old.revision_id) <> 'draft' BEGIN
  SELECT RAISE(ABORT, 'revision-frozen');
END;
