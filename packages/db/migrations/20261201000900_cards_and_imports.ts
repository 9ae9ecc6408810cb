import type { Knex } from "knex";

/**
 * Spreadsheet imports and the problems found in their rows.
 * - imports: one uploaded file (kept in object storage under a key we make), what it holds, the
 *   branch it goes into, the column mapping, its state and progress (the page polls it) and counts.
 * - import_row_issues: one row per problem (row number, field, why), paged by the preview, so a
 *   file with many bad rows never becomes one huge JSON value.
 * Also an index for the card verification queue ordered by technician.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("imports", (t) => {
    t.increments("id");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("branch_id").notNullable().references("id").inTable("branches");
    t.string("kind", 16).notNullable(); // appliances | cylinders | jobs
    t.string("state", 16).notNullable(); // mapping | checking | checked | importing | imported | failed | cancelled
    t.string("file_key", 300).notNullable(); // object storage key made by us
    t.string("file_format", 8).notNullable(); // xlsx | csv
    t.string("file_label", 200).notNullable(); // a display name cleaned of anything path-like; never used as a key
    t.integer("file_size").notNullable();
    t.text("headings").notNullable(); // JSON string[]
    t.text("sample").notNullable(); // JSON string[][]: the first rows, for the mapping screen
    t.text("mapping"); // JSON { fieldKey: columnIndex | null }
    t.text("preview"); // JSON: the first checked rows with their outcome
    t.integer("total_rows").notNullable().defaultTo(0); // data rows seen so far (final once checked)
    t.integer("valid_rows").notNullable().defaultTo(0);
    t.integer("invalid_rows").notNullable().defaultTo(0);
    t.integer("imported_rows").notNullable().defaultTo(0);
    t.integer("progress").notNullable().defaultTo(0); // 0–100 of the current step
    t.string("progress_note", 300);
    t.text("error"); // why it failed, in plain words
    t.integer("created_by").notNullable().references("id").inTable("users");
    t.string("created_at", 32).notNullable();
    t.string("updated_at", 32).notNullable();
    t.string("checked_at", 32);
    t.string("finished_at", 32);
    t.index(["organisation_id", "created_at", "id"]);
    t.index(["branch_id", "created_at", "id"]);
    t.index(["state"]);
  });

  await knex.schema.createTable("import_row_issues", (t) => {
    t.increments("id");
    t.integer("import_id").notNullable().references("id").inTable("imports");
    t.integer("organisation_id").notNullable().references("id").inTable("organisations");
    t.integer("row_number").notNullable(); // as the spreadsheet shows it (the heading row is 1)
    t.string("field", 40); // field key; null = the row as a whole
    t.string("column_label", 200); // the file's own heading of that column
    t.string("value", 300); // what the cell held (shortened)
    t.text("message").notNullable();
    t.index(["import_id", "row_number", "id"]);
  });

  await knex.schema.alterTable("certifications", (t) => {
    t.index(["organisation_id", "user_id", "uploaded_at"], "certifications_org_user_uploaded_idx");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("certifications", (t) => {
    t.dropIndex(["organisation_id", "user_id", "uploaded_at"], "certifications_org_user_uploaded_idx");
  });
  await knex.schema.dropTableIfExists("import_row_issues");
  await knex.schema.dropTableIfExists("imports");
}
