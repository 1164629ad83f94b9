-- The quality record is append-only: measurements, evaluations, dispositions, the hash chain and
-- the audit trail can be inserted but never changed or removed; a correction is a new row that points at what it corrects.
CREATE TRIGGER `measurement_no_update` BEFORE UPDATE ON `measurement` BEGIN SELECT RAISE(ABORT, 'measurement rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `measurement_no_delete` BEFORE DELETE ON `measurement` BEGIN SELECT RAISE(ABORT, 'measurement rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `partial_no_update` BEFORE UPDATE ON `partial` BEGIN SELECT RAISE(ABORT, 'partial rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `partial_no_delete` BEFORE DELETE ON `partial` BEGIN SELECT RAISE(ABORT, 'partial rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `evaluation_no_update` BEFORE UPDATE ON `evaluation` BEGIN SELECT RAISE(ABORT, 'evaluation rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `evaluation_no_delete` BEFORE DELETE ON `evaluation` BEGIN SELECT RAISE(ABORT, 'evaluation rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `disposition_no_update` BEFORE UPDATE ON `disposition` BEGIN SELECT RAISE(ABORT, 'disposition rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `disposition_no_delete` BEFORE DELETE ON `disposition` BEGIN SELECT RAISE(ABORT, 'disposition rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `ledger_entry_no_update` BEFORE UPDATE ON `ledger_entry` BEGIN SELECT RAISE(ABORT, 'ledger_entry rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `ledger_entry_no_delete` BEFORE DELETE ON `ledger_entry` BEGIN SELECT RAISE(ABORT, 'ledger_entry rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `audit_event_no_update` BEFORE UPDATE ON `audit_event` BEGIN SELECT RAISE(ABORT, 'audit_event rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `audit_event_no_delete` BEFORE DELETE ON `audit_event` BEGIN SELECT RAISE(ABORT, 'audit_event rows are append-only'); END;
