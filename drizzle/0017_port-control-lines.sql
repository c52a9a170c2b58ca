-- Control lines on every port (docs/decisions/013): rtsMode, ctsMode, dtrMode, rtsLeadMs, rtsTailMs and echo are
-- added to every stored copy of a port's settings that lacks them, derived from handshake and rs485Direction:
-- rs485Direction "rts" → rtsMode "transmit"; handshake "rts-cts" → rtsMode "flow" and ctsMode "gate"; "dtr-dsr" →
-- dtrMode "flow"; otherwise RTS and DTR "off" and CTS "ignore"; no lead, no tail, no echo. Where one copy had both
-- handshake "rts-cts" and rs485Direction "rts" (RTS cannot do both), an RS-485 port keeps its direction control
-- (handshake becomes "none") and any other port keeps its flow control (rs485Direction becomes "none"), so the older
-- keys and the new ones agree on every copy. Copies already carrying rtsMode are left as they are.
-- Ports:
UPDATE `port` SET `settings` = json_set(`settings`,
    '$.handshake', CASE WHEN (json_extract(`settings`, '$.handshake') IS 'rts-cts' AND json_extract(`settings`, '$.rs485Direction') IS 'rts') AND coalesce(json_extract(`settings`, '$.interface'), '') LIKE 'rs485%' THEN 'none' ELSE coalesce(json_extract(`settings`, '$.handshake'), 'none') END,
    '$.rs485Direction', CASE WHEN (json_extract(`settings`, '$.handshake') IS 'rts-cts' AND json_extract(`settings`, '$.rs485Direction') IS 'rts') AND NOT (coalesce(json_extract(`settings`, '$.interface'), '') LIKE 'rs485%') THEN 'none' ELSE coalesce(json_extract(`settings`, '$.rs485Direction'), 'none') END,
    '$.rtsMode', CASE WHEN (json_extract(`settings`, '$.handshake') IS 'rts-cts' AND json_extract(`settings`, '$.rs485Direction') IS 'rts') THEN (CASE WHEN coalesce(json_extract(`settings`, '$.interface'), '') LIKE 'rs485%' THEN 'transmit' ELSE 'flow' END)
      WHEN json_extract(`settings`, '$.rs485Direction') IS 'rts' THEN 'transmit' WHEN json_extract(`settings`, '$.handshake') IS 'rts-cts' THEN 'flow' ELSE 'off' END,
    '$.ctsMode', CASE WHEN json_extract(`settings`, '$.handshake') IS 'rts-cts' AND NOT ((json_extract(`settings`, '$.handshake') IS 'rts-cts' AND json_extract(`settings`, '$.rs485Direction') IS 'rts') AND coalesce(json_extract(`settings`, '$.interface'), '') LIKE 'rs485%') THEN 'gate' ELSE 'ignore' END,
    '$.dtrMode', CASE WHEN json_extract(`settings`, '$.handshake') IS 'dtr-dsr' THEN 'flow' ELSE 'off' END,
    '$.rtsLeadMs', 0, '$.rtsTailMs', 0, '$.echo', json('false'))
WHERE json_type(`settings`) = 'object' AND json_extract(`settings`, '$.rtsMode') IS NULL;--> statement-breakpoint
-- Revision snapshots of ports:
UPDATE `revision` SET `snapshot` = json_set(`snapshot`, '$.settings', json(json_set(json_extract(`snapshot`, '$.settings'),
    '$.handshake', CASE WHEN (json_extract(json_extract(`snapshot`, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(`snapshot`, '$.settings'), '$.rs485Direction') IS 'rts') AND coalesce(json_extract(json_extract(`snapshot`, '$.settings'), '$.interface'), '') LIKE 'rs485%' THEN 'none' ELSE coalesce(json_extract(json_extract(`snapshot`, '$.settings'), '$.handshake'), 'none') END,
    '$.rs485Direction', CASE WHEN (json_extract(json_extract(`snapshot`, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(`snapshot`, '$.settings'), '$.rs485Direction') IS 'rts') AND NOT (coalesce(json_extract(json_extract(`snapshot`, '$.settings'), '$.interface'), '') LIKE 'rs485%') THEN 'none' ELSE coalesce(json_extract(json_extract(`snapshot`, '$.settings'), '$.rs485Direction'), 'none') END,
    '$.rtsMode', CASE WHEN (json_extract(json_extract(`snapshot`, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(`snapshot`, '$.settings'), '$.rs485Direction') IS 'rts') THEN (CASE WHEN coalesce(json_extract(json_extract(`snapshot`, '$.settings'), '$.interface'), '') LIKE 'rs485%' THEN 'transmit' ELSE 'flow' END)
      WHEN json_extract(json_extract(`snapshot`, '$.settings'), '$.rs485Direction') IS 'rts' THEN 'transmit' WHEN json_extract(json_extract(`snapshot`, '$.settings'), '$.handshake') IS 'rts-cts' THEN 'flow' ELSE 'off' END,
    '$.ctsMode', CASE WHEN json_extract(json_extract(`snapshot`, '$.settings'), '$.handshake') IS 'rts-cts' AND NOT ((json_extract(json_extract(`snapshot`, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(`snapshot`, '$.settings'), '$.rs485Direction') IS 'rts') AND coalesce(json_extract(json_extract(`snapshot`, '$.settings'), '$.interface'), '') LIKE 'rs485%') THEN 'gate' ELSE 'ignore' END,
    '$.dtrMode', CASE WHEN json_extract(json_extract(`snapshot`, '$.settings'), '$.handshake') IS 'dtr-dsr' THEN 'flow' ELSE 'off' END,
    '$.rtsLeadMs', 0, '$.rtsTailMs', 0, '$.echo', json('false'))))
WHERE `entity_type` = 'port' AND json_type(`snapshot`, '$.settings') = 'object' AND json_extract(`snapshot`, '$.settings.rtsMode') IS NULL;--> statement-breakpoint
-- Device profiles' ports, each in its place:
UPDATE `device_profile` SET `ports` = (
  SELECT json_group_array(json(CASE WHEN json_type(p.value, '$.settings') = 'object' AND json_extract(p.value, '$.settings.rtsMode') IS NULL
    THEN json_set(p.value, '$.settings', json(json_set(json_extract(p.value, '$.settings'),
    '$.handshake', CASE WHEN (json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts') AND coalesce(json_extract(json_extract(p.value, '$.settings'), '$.interface'), '') LIKE 'rs485%' THEN 'none' ELSE coalesce(json_extract(json_extract(p.value, '$.settings'), '$.handshake'), 'none') END,
    '$.rs485Direction', CASE WHEN (json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts') AND NOT (coalesce(json_extract(json_extract(p.value, '$.settings'), '$.interface'), '') LIKE 'rs485%') THEN 'none' ELSE coalesce(json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction'), 'none') END,
    '$.rtsMode', CASE WHEN (json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts') THEN (CASE WHEN coalesce(json_extract(json_extract(p.value, '$.settings'), '$.interface'), '') LIKE 'rs485%' THEN 'transmit' ELSE 'flow' END)
      WHEN json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts' THEN 'transmit' WHEN json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' THEN 'flow' ELSE 'off' END,
    '$.ctsMode', CASE WHEN json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND NOT ((json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts') AND coalesce(json_extract(json_extract(p.value, '$.settings'), '$.interface'), '') LIKE 'rs485%') THEN 'gate' ELSE 'ignore' END,
    '$.dtrMode', CASE WHEN json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'dtr-dsr' THEN 'flow' ELSE 'off' END,
    '$.rtsLeadMs', 0, '$.rtsTailMs', 0, '$.echo', json('false'))))
    ELSE p.value END))
  FROM (SELECT value FROM json_each(`device_profile`.`ports`) ORDER BY key) p)
WHERE json_type(`ports`) = 'array'
  AND EXISTS (SELECT 1 FROM json_each(`device_profile`.`ports`) e WHERE json_type(e.value, '$.settings') = 'object' AND json_extract(e.value, '$.settings.rtsMode') IS NULL);--> statement-breakpoint
-- Revision snapshots of profiles:
UPDATE `revision` SET `snapshot` = json_set(`snapshot`, '$.ports', (
  SELECT json_group_array(json(CASE WHEN json_type(p.value, '$.settings') = 'object' AND json_extract(p.value, '$.settings.rtsMode') IS NULL
    THEN json_set(p.value, '$.settings', json(json_set(json_extract(p.value, '$.settings'),
    '$.handshake', CASE WHEN (json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts') AND coalesce(json_extract(json_extract(p.value, '$.settings'), '$.interface'), '') LIKE 'rs485%' THEN 'none' ELSE coalesce(json_extract(json_extract(p.value, '$.settings'), '$.handshake'), 'none') END,
    '$.rs485Direction', CASE WHEN (json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts') AND NOT (coalesce(json_extract(json_extract(p.value, '$.settings'), '$.interface'), '') LIKE 'rs485%') THEN 'none' ELSE coalesce(json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction'), 'none') END,
    '$.rtsMode', CASE WHEN (json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts') THEN (CASE WHEN coalesce(json_extract(json_extract(p.value, '$.settings'), '$.interface'), '') LIKE 'rs485%' THEN 'transmit' ELSE 'flow' END)
      WHEN json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts' THEN 'transmit' WHEN json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' THEN 'flow' ELSE 'off' END,
    '$.ctsMode', CASE WHEN json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND NOT ((json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'rts-cts' AND json_extract(json_extract(p.value, '$.settings'), '$.rs485Direction') IS 'rts') AND coalesce(json_extract(json_extract(p.value, '$.settings'), '$.interface'), '') LIKE 'rs485%') THEN 'gate' ELSE 'ignore' END,
    '$.dtrMode', CASE WHEN json_extract(json_extract(p.value, '$.settings'), '$.handshake') IS 'dtr-dsr' THEN 'flow' ELSE 'off' END,
    '$.rtsLeadMs', 0, '$.rtsTailMs', 0, '$.echo', json('false'))))
    ELSE p.value END))
  FROM (SELECT value FROM json_each(`revision`.`snapshot`, '$.ports') ORDER BY key) p))
WHERE `entity_type` = 'profile' AND json_type(`snapshot`, '$.ports') = 'array'
  AND EXISTS (SELECT 1 FROM json_each(`revision`.`snapshot`, '$.ports') e WHERE json_type(e.value, '$.settings') = 'object' AND json_extract(e.value, '$.settings.rtsMode') IS NULL);
