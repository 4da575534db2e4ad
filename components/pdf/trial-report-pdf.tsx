import "server-only";
import { Document, Font, Page, StyleSheet, Text, View, renderToBuffer } from "@react-pdf/renderer";
import { pdfSafeText, type ReportTable, type TrialReportDocument } from "@/lib/trials/report-document";

// Helvetica is built into every PDF reader, so nothing is embedded or fetched; pdfSafeText keeps to its characters.
// Words are never split with a hyphen at a line's end: a block code or a strain name stays whole.
Font.registerHyphenationCallback((word) => [word]);

const styles = StyleSheet.create({
  page: {
    paddingTop: 40,
    paddingBottom: 56,
    paddingHorizontal: 44,
    fontFamily: "Helvetica",
    fontSize: 10,
    lineHeight: 1.35,
    color: "#1f2421",
  },
  title: { fontFamily: "Helvetica-Bold", fontSize: 16, marginBottom: 4 },
  subtitle: { fontSize: 10, color: "#4a524c", marginBottom: 14 },
  heading: { fontFamily: "Helvetica-Bold", fontSize: 12, marginTop: 12, marginBottom: 4 },
  paragraph: { marginBottom: 4 },
  tableTitle: { fontFamily: "Helvetica-Bold", marginTop: 6, marginBottom: 2 },
  caption: { fontSize: 9, color: "#4a524c", marginBottom: 3 },
  row: { flexDirection: "row", borderTopWidth: 0.5, borderTopColor: "#b8b2a2", paddingVertical: 2 },
  headerRow: { flexDirection: "row", paddingVertical: 2 },
  headerCell: { flex: 1, fontFamily: "Helvetica-Bold", paddingRight: 6 },
  cell: { flex: 1, paddingRight: 6 },
  footer: { position: "absolute", bottom: 24, left: 44, right: 44, fontSize: 8, color: "#4a524c" },
});

/** A table kept on one page; its title is left out where the section's heading already says it. */
function Table({ table, heading }: { table: ReportTable; heading: string }) {
  return (
    <View wrap={false}>
      {table.title !== heading ? <Text style={styles.tableTitle}>{pdfSafeText(table.title)}</Text> : null}
      {table.caption ? <Text style={styles.caption}>{pdfSafeText(table.caption)}</Text> : null}
      <View style={styles.headerRow}>
        {table.columns.map((column) => (
          <Text key={column} style={styles.headerCell}>
            {pdfSafeText(column)}
          </Text>
        ))}
      </View>
      {table.rows.map((row, index) => (
        <View key={index} style={styles.row}>
          {row.map((cell, cellIndex) => (
            <Text key={cellIndex} style={styles.cell}>
              {pdfSafeText(cell)}
            </Text>
          ))}
        </View>
      ))}
    </View>
  );
}

/** The trial report as a PDF file: the pages lib/trials/report-document.ts lays out, in A4. */
export function renderTrialReportPdf(report: TrialReportDocument): Promise<Buffer> {
  return renderToBuffer(
    <Document title={pdfSafeText(report.title)} author="Rhizomorph" language="en">
      {report.pages.map((sections, pageIndex) => (
        <Page key={pageIndex} size="A4" style={styles.page}>
          {pageIndex === 0 ? (
            <>
              <Text style={styles.title}>{pdfSafeText(report.title)}</Text>
              <Text style={styles.subtitle}>{pdfSafeText(report.subtitle)}</Text>
            </>
          ) : null}
          {sections.map((section) => (
            <View key={section.heading}>
              <Text style={styles.heading}>{pdfSafeText(section.heading)}</Text>
              {section.paragraphs.map((paragraph) => (
                <Text key={paragraph} style={styles.paragraph}>
                  {pdfSafeText(paragraph)}
                </Text>
              ))}
              {section.tables.map((table) => (
                <Table key={table.title} table={table} heading={section.heading} />
              ))}
            </View>
          ))}
          <Text
            style={styles.footer}
            fixed
            render={({ pageNumber, totalPages }) => pdfSafeText(`${report.footer} Page ${pageNumber} of ${totalPages}.`)}
          />
        </Page>
      ))}
    </Document>,
  );
}
