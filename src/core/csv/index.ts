export { createFixedFormatter, csvCell } from "./cells";
export { CsvByteWriter, encodeCell, IsoTimeBytes, ISO_TIME_BYTES, MAX_FIXED_BYTES, putBytes, putFixedAt, type ByteSink } from "./csv-byte-writer";
