-- Raw batches stored as float32 arrays cannot be carried into the compressed format of the next
-- migration without the server's codec; they are removed (raw data is kept 24 h by default, and
-- the one-second roll-ups stay).
DELETE FROM "fast_batches";
