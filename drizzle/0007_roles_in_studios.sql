-- Roles belong to a studio's team now (the member table, filled from this column by the previous
-- migration): a person's own role goes.
ALTER TABLE "user" DROP COLUMN "role";
