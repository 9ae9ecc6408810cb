import ExcelJS from "exceljs";
import { IMPORT_FIELDS, IMPORT_KIND_LABELS, importTemplateQuery } from "@coldtrail/core";
import { route } from "@/lib/api/route";

/**
 * A template per record kind: the first worksheet holds only the column headings (required ones
 * marked *), so nothing but the person's own rows is ever imported; a second worksheet explains
 * each column with an example.
 */
export const GET = route({ can: ["create", "Import"], query: importTemplateQuery }, async ({ query }) => {
  const fields = IMPORT_FIELDS[query.kind];
  const book = new ExcelJS.Workbook();
  book.creator = "Coldtrail";
  const sheet = book.addWorksheet(IMPORT_KIND_LABELS[query.kind]);
  sheet.columns = fields.map((f) => ({
    header: f.required ? `${f.label} *` : f.label,
    key: f.key,
    width: Math.max(14, f.label.length + 4),
  }));
  sheet.getRow(1).font = { bold: true };
  sheet.views = [{ state: "frozen", ySplit: 1 }];

  const help = book.addWorksheet("How to fill it in");
  help.columns = [
    { header: "Column", key: "label", width: 34 },
    { header: "Required", key: "required", width: 10 },
    { header: "What to enter", key: "hint", width: 80 },
    { header: "Example", key: "example", width: 28 },
  ];
  help.getRow(1).font = { bold: true };
  for (const f of fields) help.addRow({ label: f.label, required: f.required ? "yes" : "", hint: f.hint, example: f.example });
  help.addRow({});
  help.addRow({
    label:
      "Only the first worksheet is imported. Keep the headings in its first row; other column orders and headings can be matched on the import page.",
  });

  const buffer = Buffer.from(await book.xlsx.writeBuffer());
  return new Response(buffer, {
    headers: {
      "content-type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
      "content-disposition": `attachment; filename="coldtrail-${query.kind}-template.xlsx"`,
      "content-length": String(buffer.byteLength),
      "cache-control": "no-store",
    },
  });
});
