-- Device tags become unique per machine ignoring the letter case of A-Z (SQLite's NOCASE), as port names
-- per device (0006). Live devices that would clash keep the tag of the first one (by creation time, then id);
-- each later one gets "tag (2)", "tag (3)"… in that order, or "tag (duplicate <rowid>)" when that tag is
-- taken too, with its version raised and a revision saying why. The search index follows by its triggers.
CREATE TEMP TABLE `device_rename` AS
  SELECT r.id, r.tag AS old_tag,
    CASE WHEN EXISTS (
      SELECT 1 FROM device q WHERE q.machine_id = r.machine_id AND q.deleted_at IS NULL AND q.tag = (r.tag || ' (' || r.rank || ')') COLLATE NOCASE
    ) THEN r.tag || ' (duplicate ' || r.rid || ')' ELSE r.tag || ' (' || r.rank || ')' END AS new_tag
  FROM (
    SELECT id, rowid AS rid, tag, machine_id,
      row_number() OVER (PARTITION BY machine_id, tag COLLATE NOCASE ORDER BY created_at, id) AS rank
    FROM device WHERE deleted_at IS NULL
  ) r
  WHERE r.rank > 1;--> statement-breakpoint
INSERT INTO `revision` (id, team_id, entity_type, entity_id, version, action, user_id, user_name, summary, changes, snapshot, created_at)
  SELECT 'rev_' || lower(hex(randomblob(12))), d.team_id, 'device', d.id, d.version + 1, 'update', NULL, '',
    'Renamed: another device on this machine has the same tag in other letter case',
    json_array(json_object('field', 'tag', 'from', x.old_tag, 'to', x.new_tag)),
    json_object('machineId', d.machine_id, 'profileId', d.profile_id, 'tag', x.new_tag, 'name', d.name, 'role', d.role, 'maker', d.maker,
      'model', d.model, 'serialNumber', d.serial_number, 'firmware', d.firmware, 'location', d.location, 'notes', d.notes),
    CAST(strftime('%s', 'now') AS INTEGER) * 1000
  FROM device d JOIN device_rename x ON x.id = d.id;--> statement-breakpoint
UPDATE `device` SET tag = (SELECT new_tag FROM device_rename x WHERE x.id = device.id), version = version + 1
  WHERE id IN (SELECT id FROM device_rename);--> statement-breakpoint
DROP TABLE `device_rename`;--> statement-breakpoint
CREATE UNIQUE INDEX `device_machine_tag_nocase_uq` ON `device` (`machine_id`,"tag" COLLATE NOCASE) WHERE deleted_at IS NULL;
