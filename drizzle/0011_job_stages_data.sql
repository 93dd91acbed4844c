-- Existing requests move from the old sales words to the job's stages.
-- "contacted" becomes "called back" (and remembers when, so a cancelled consult falls back to it);
-- "proposal sent" becomes "proposal out"; "won" becomes "signed"; "lost" becomes "not going ahead",
-- keeping its reason. Every request that got past "new" was called back at some point.
UPDATE `leads` SET `called_back_at` = `updated_at` WHERE `status` IN ('contacted', 'consult-booked', 'proposal-sent', 'won');--> statement-breakpoint
UPDATE `leads` SET `status` = 'request' WHERE `status` = 'new';--> statement-breakpoint
UPDATE `leads` SET `status` = 'called-back' WHERE `status` = 'contacted';--> statement-breakpoint
UPDATE `leads` SET `status` = 'proposal-out' WHERE `status` = 'proposal-sent';--> statement-breakpoint
UPDATE `leads` SET `status` = 'signed' WHERE `status` = 'won';--> statement-breakpoint
UPDATE `leads` SET `status` = 'not-going-ahead' WHERE `status` = 'lost';
