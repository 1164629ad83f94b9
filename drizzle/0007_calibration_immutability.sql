-- Calibrations are part of the quality record: once entered they are never changed or removed.
-- A correction is a new calibration; evaluations keep pointing at the one they used.
CREATE TRIGGER `instrument_calibration_no_update` BEFORE UPDATE ON `instrument_calibration` BEGIN SELECT RAISE(ABORT, 'instrument_calibration rows are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER `instrument_calibration_no_delete` BEFORE DELETE ON `instrument_calibration` BEGIN SELECT RAISE(ABORT, 'instrument_calibration rows are append-only'); END;
