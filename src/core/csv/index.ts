export { createFixedFormatter, csvCell } from "./cells";
export { CsvByteWriter, encodeCell, IsoTimeBytes, ISO_TIME_BYTES, MAX_FIXED_BYTES, putBytes, putFixed3At, putFixed7At, type ByteSink } from "./csv-byte-writer";
