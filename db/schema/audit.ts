import { bigserial, index, jsonb, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { farms, users } from "./cooperative";

/** Append-only: the application role may insert and read, never update or delete. */
export const auditEvents = pgTable(
  "audit_events",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    occurredAt: timestamp("occurred_at", { withTimezone: true }).notNull().defaultNow(),
    actorUserId: uuid("actor_user_id").references(() => users.id, { onDelete: "set null" }),
    actorLabel: text("actor_label").notNull().default(""),
    // Set for events about one farm's own data; null for co-op-level events.
    farmId: uuid("farm_id").references(() => farms.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    subject: text("subject").notNull().default(""),
    details: jsonb("details").$type<Record<string, unknown>>().notNull().default({}),
    ip: text("ip"),
  },
  (t) => [index("audit_events_farm_time_idx").on(t.farmId, t.occurredAt), index("audit_events_time_idx").on(t.occurredAt)],
);
