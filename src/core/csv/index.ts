export { createFixedFormatter, csvCell } from "./cells";
export { CsvByteWriter, type ByteSink } from "./csv-byte-writer";
