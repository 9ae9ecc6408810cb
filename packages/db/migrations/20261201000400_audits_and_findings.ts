import type { Knex } from "knex";

/** Audits, their findings and everything people attach to findings; saved views and in-app notifications. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("audits", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.text("scope").notNullable(); // JSON { branchIds: number[] }
    t.string("period_from", 10).notNullable();
    t.string("period_to", 10).notNullable();
    t.text("rule_packs").notNullable(); // JSON array
    t.string("state", 16).notNullable().defaultTo("queued"); // queued | running | done | failed
    t.integer("progress").notNullable().defaultTo(0); // 0–100
    t.string("progress_note", 300);
    t.text("error");
    t.text("summary"); // JSON counts by branch, rule and severity once done
    t.integer("started_by").notNullable().references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.string("started_at", 32);
    t.string("finished_at", 32);
    t.index(["organisation_id", "created_at"]);
    t.index(["state"]);
  });

  await knex.schema.createTable("findings", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.integer("audit_id").references("id").inTable("audits"); // the last audit that found it (null: raised by a record save)
    t.integer("first_audit_id").references("id").inTable("audits");
    t.string("rule_id", 64).notNullable();
    t.string("identity_key", 300).notNullable(); // stable: rule + record, so re-runs find the same finding
    t.string("record_type", 40).notNullable();
    t.integer("record_id");
    t.integer("appliance_id").references("id").inTable("appliances");
    t.integer("technician_id").references("id").inTable("users"); // the technician the finding names
    t.string("severity", 16).notNullable();
    t.string("state", 20).notNullable().defaultTo("open");
    t.string("title", 300).notNullable();
    t.text("detail").notNullable();
    t.text("fix").notNullable();
    t.string("citation", 300).notNullable();
    t.string("due_on", 10);
    t.integer("assignee_id").references("id").inTable("users");
    t.text("waiver_reason");
    t.text("data"); // JSON: the inputs the rule used
    t.string("opened_at", 32).notNullable();
    t.string("last_seen_at", 32).notNullable();
    t.string("state_changed_at", 32).notNullable();
    t.string("closed_at", 32);
    t.string("updated_at", 32).notNullable();
    t.unique(["organisation_id", "identity_key"]);
    t.index(["organisation_id", "state", "severity"]);
    t.index(["branch_id", "state", "due_on"]);
    t.index(["branch_id", "rule_id"]);
    t.index(["assignee_id", "state"]);
    t.index(["technician_id", "state"]);
    t.index(["record_type", "record_id"]);
    t.index(["appliance_id"]);
    t.index(["audit_id"]);
  });

  await knex.schema.createTable("audit_findings", (t) => {
    // Which findings each audit run saw, so an audit's export lists exactly its own findings.
    t.integer("audit_id").notNullable().references("id").inTable("audits");
    t.integer("finding_id").notNullable().references("id").inTable("findings");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.string("severity", 16).notNullable();
    t.primary(["audit_id", "finding_id"]);
    t.index(["finding_id"]);
    t.index(["audit_id", "branch_id"]);
  });

  await knex.schema.createTable("finding_events", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("finding_id").notNullable().references("id").inTable("findings");
    t.integer("actor_id").references("id").inTable("users"); // null = the audit engine
    t.string("at", 32).notNullable();
    t.string("action", 32).notNullable(); // opened | assigned | fix_proposed | accepted | reopened | waived | no_longer_found | found_again
    t.string("from_state", 20);
    t.string("to_state", 20);
    t.text("note");
    t.text("data"); // JSON
    t.index(["finding_id", "at"]);
    t.index(["organisation_id", "at"]);
  });

  await knex.schema.createTable("comments", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").references("id").inTable("branches");
    t.string("subject_type", 40).notNullable(); // finding, job, appliance …
    t.integer("subject_id").notNullable();
    t.integer("author_id").notNullable().references("id").inTable("users");
    t.text("body").notNullable();
    t.string("created_at", 32).notNullable();
    t.string("edited_at", 32);
    t.index(["subject_type", "subject_id", "created_at"]);
  });

  await knex.schema.createTable("evidence", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").references("id").inTable("branches");
    t.string("subject_type", 40).notNullable();
    t.integer("subject_id").notNullable();
    t.string("file_key", 300).notNullable();
    t.string("file_name", 200).notNullable(); // our own sanitised display name, never the client's path
    t.string("mime", 100).notNullable();
    t.integer("size_bytes").notNullable();
    t.string("thumbnail_key", 300);
    t.text("note");
    t.integer("uploaded_by").notNullable().references("id").inTable("users");
    t.string("uploaded_at", 32).notNullable();
    t.index(["subject_type", "subject_id", "uploaded_at"]);
    t.index(["organisation_id", "uploaded_at"]);
  });

  await knex.schema.createTable("saved_views", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("user_id").notNullable().references("id").inTable("users");
    t.string("list", 40).notNullable(); // findings | jobs | appliances …
    t.string("name", 100).notNullable();
    t.text("query").notNullable(); // JSON: filters, sort, grouping, columns
    t.string("created_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.unique(["user_id", "list", "name"]);
  });

  await knex.schema.createTable("notifications", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("user_id").notNullable().references("id").inTable("users");
    t.string("kind", 40).notNullable();
    t.string("title", 300).notNullable();
    t.text("body");
    t.string("link", 500);
    t.string("subject_type", 40);
    t.integer("subject_id");
    t.string("created_at", 32).notNullable();
    t.string("read_at", 32);
    t.string("emailed_at", 32);
    t.index(["user_id", "read_at", "created_at"]);
    t.index(["organisation_id", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ["notifications", "saved_views", "evidence", "comments", "finding_events", "audit_findings", "findings", "audits"]) {
    await knex.schema.dropTableIfExists(table);
  }
}
