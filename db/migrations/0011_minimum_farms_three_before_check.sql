-- The minimum number of farms behind a published figure may no longer be 2 (with two farms each
-- learns the other's figures by subtracting its own). Raise any co-op still at 2 before the next
-- migration's check constraint requires 3 or more.
UPDATE cooperative_settings SET minimum_farms = 3 WHERE minimum_farms < 3;
