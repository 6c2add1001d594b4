ALTER TABLE `scenario_revisions` ADD `block_count` integer;--> statement-breakpoint
ALTER TABLE `scenario_revisions` ADD `port_names` text;--> statement-breakpoint
UPDATE `scenario_revisions` SET `block_count` = coalesce(json_array_length(`content`, '$.blocks'), 0), `port_names` = (SELECT json_group_array(json_extract(p.value, '$.name')) FROM json_each(`content`, '$.ports') AS p WHERE json_type(p.value, '$.name') = 'text');
