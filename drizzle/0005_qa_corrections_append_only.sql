-- Corrections are part of the quality record and append-only like it: a strike void, a certificate
-- withdrawal and a batch certificate can be inserted but never changed or removed.
CREATE TRIGGER `strike_void_no_update` BEFORE UPDATE ON `strike_void` BEGIN SELECT RAISE(ABORT, 'strike_void rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `strike_void_no_delete` BEFORE DELETE ON `strike_void` BEGIN SELECT RAISE(ABORT, 'strike_void rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `certificate_withdrawal_no_update` BEFORE UPDATE ON `certificate_withdrawal` BEGIN SELECT RAISE(ABORT, 'certificate_withdrawal rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `certificate_withdrawal_no_delete` BEFORE DELETE ON `certificate_withdrawal` BEGIN SELECT RAISE(ABORT, 'certificate_withdrawal rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `batch_certificate_no_update` BEFORE UPDATE ON `batch_certificate` BEGIN SELECT RAISE(ABORT, 'batch_certificate rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `batch_certificate_no_delete` BEFORE DELETE ON `batch_certificate` BEGIN SELECT RAISE(ABORT, 'batch_certificate rows are append-only'); END;
