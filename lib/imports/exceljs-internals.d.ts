// The exceljs 4.4 modules the workbook reader uses beside the public API (read from
// node_modules/exceljs/lib). tests/unit/imports/xlsx-internals.test.ts pins their shapes.

declare module "exceljs/lib/utils/parse-sax.js" {
  type SaxEvent =
    | { eventType: "opentag"; value: { name: string; attributes: Record<string, string> } }
    | { eventType: "text"; value: string }
    | { eventType: "closetag"; value: { name: string } };
  /** saxes over the chunks; one array of events per chunk; throws the parser's first error. */
  export default function parseSax(chunks: AsyncIterable<string | Uint8Array>): AsyncGenerator<SaxEvent[]>;
}

declare module "exceljs/lib/xlsx/xform/style/styles-xform.js" {
  /** The workbook's styles (xl/styles.xml) as the in-memory reader parses them. */
  export default class StylesXform {
    parseStream(chunks: AsyncIterable<string | Uint8Array>): Promise<unknown>;
    getStyleModel(id: number): { numFmt?: string } | undefined;
  }
}

declare module "exceljs/lib/utils/utils.js" {
  const utils: {
    isDateFmt(format: string | undefined): boolean;
    excelToDate(serial: number, date1904?: boolean): Date;
    xmlDecode(text: string): string;
  };
  export default utils;
}
