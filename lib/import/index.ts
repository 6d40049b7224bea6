/** Pure helpers for CSV imports: columns, mapping, cell values, read options, rows, export. */
export * from "./columns";
export * from "./components";
export * from "./csv-export";
export * from "./date-order";
export * from "./mapping";
export * from "./read-options";
export * from "./row-schemas";
export * from "./rows";
export * from "./sniff";
export * from "./symptoms";
export * from "./values";
