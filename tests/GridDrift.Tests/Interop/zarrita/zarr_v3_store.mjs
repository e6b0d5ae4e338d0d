// An invented CF record as a Zarr v3 store, written by zarrita (npm) and read back by zarrita
// as the witness GridDrift's Zarr v3 reading is checked against.
//
// usage: node zarr_v3_store.mjs STORE CODEC OUT.bin [consolidated]
// CODEC: none gzip zlib zstd lz4 blosc-lz4-shuffle blosc-zstd-bitshuffle blosc-blosclz-noshuffle
// consolidated: after the witness is read, every array's zarr.json moves into the root
// document's inline consolidated_metadata (zarr-python's convention for v3: kind "inline",
// must_understand false, documents by path) and is removed from the array's folder, so a
// reader can only find the arrays there.
//
// The store: time, lat (north to south), lon coordinates with dimension_names; tcwv (float32,
// 7 x 25 x 144, chunks 3 x 13 x 72, fill NaN, the codec given, NaN cells, one chunk never
// written); q (int16, big-endian bytes codec, crc32c, keys spelled "0.0.0"); tcwv_shards (the
// same values in shards of 3 x 26 x 144 holding inner chunks of 1 x 13 x 72 with the codec
// given, index at the end with crc32c, one inner chunk never written). zarrita cannot write
// shards, so their bytes are laid out here by the sharding specification with zarrita's own
// codecs, and zarrita reads them back.
// OUT.bin: tcwv, q and tcwv_shards as little-endian float64, as zarrita reads them.
import * as fs from "node:fs";
import * as path from "node:path";
import * as zarr from "zarrita";
import FileSystemStore from "@zarrita/storage/fs";

const [storePath, codecName, outPath, layout] = process.argv.slice(2);
const nt = 7, ny = 25, nx = 144;

function compressor(name) {
  if (name === "none") return [];
  if (name === "gzip" || name === "zlib") return [{ name, configuration: { level: 4 } }];
  if (name === "zstd") return [{ name: "zstd", configuration: { level: 3, checksum: false } }];
  if (name === "lz4") return [{ name: "numcodecs.lz4", configuration: { acceleration: 1 } }];
  const [, cname, shuffle] = name.split("-");
  return [{ name: "blosc", configuration: { cname, clevel: 5, shuffle, typesize: 4, blocksize: 0 } }];
}

// zarrita decodes gzip and zlib itself but cannot encode them: numcodecs (npm), which zarrita uses for its other compressors, writes them
zarr.registry.set("gzip", () => import("numcodecs/gzip").then((m) => m.default));
zarr.registry.set("zlib", () => import("numcodecs/zlib").then((m) => m.default));

// zarrita strips crc32c checksums without writing or checking them: this writer appends CRC-32C
// (RFC 3720 §B.4, reflected polynomial 0x82F63B78, little-endian) itself
const crcTable = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0x82f63b78 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});
function crc32c(bytes) {
  let c = 0xffffffff;
  for (const b of bytes) c = crcTable[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
class Crc32cWriter {
  kind = "bytes_to_bytes";
  static fromConfig() { return new Crc32cWriter(); }
  encode(bytes) {
    const out = new Uint8Array(bytes.length + 4);
    out.set(bytes);
    new DataView(out.buffer).setUint32(bytes.length, crc32c(bytes), true);
    return out;
  }
  decode(bytes) { return new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength - 4); }
  computeEncodedSize(size) { return size + 4; }
}
zarr.registry.set("crc32c", () => Crc32cWriter);

const store = new FileSystemStore(storePath);
const root = await zarr.create(store, { attributes: { title: "invented water-vapour record (synthetic)", Conventions: "CF-1.8" } });

async function write(name, dtype, shape, chunkShape, values, options = {}) {
  const array = await zarr.create(root.resolve(name), { shape, chunkShape, dtype, ...options });
  await zarr.set(array, null, { data: values, shape, stride: shape.map((_, d) => shape.slice(d + 1).reduce((a, b) => a * b, 1)) });
  return array;
}

await write("time", "float64", [nt], [nt], Float64Array.from({ length: nt }, (_, t) => 6 * t), {
  dimensionNames: ["time"], attributes: { units: "hours since 2031-01-01 00:00:00", calendar: "standard", standard_name: "time" } });
await write("lat", "float32", [ny], [ny], Float32Array.from({ length: ny }, (_, j) => 60 - 5 * j), {
  dimensionNames: ["lat"], attributes: { units: "degrees_north", standard_name: "latitude" } });
await write("lon", "float32", [nx], [nx], Float32Array.from({ length: nx }, (_, i) => 2.5 * i), {
  dimensionNames: ["lon"], attributes: { units: "degrees_east", standard_name: "longitude" } });

const field = new Float32Array(nt * ny * nx);
for (let t = 0; t < nt; t++)
  for (let j = 0; j < ny; j++)
    for (let i = 0; i < nx; i++)
      field[(t * ny + j) * nx + i] = 25 + 15 * Math.cos((60 - 5 * j) * Math.PI / 180) * Math.sin(i / 9) + 0.7 * t + 0.01 * i;
for (let i = 10; i < 20; i++) field[(2 * ny + 4) * nx + i] = NaN;
const tcwvAttributes = { units: "kg m-2", standard_name: "atmosphere_mass_content_of_water_vapor", long_name: "total column water vapour (invented)", _FillValue: "NaN" };
await write("tcwv", "float32", [nt, ny, nx], [3, 13, 72], field, {
  dimensionNames: ["time", "lat", "lon"], fillValue: NaN, attributes: tcwvAttributes,
  codecs: [{ name: "bytes", configuration: { endian: "little" } }, ...compressor(codecName)] });
fs.rmSync(path.join(storePath, "tcwv", "c", "2", "1", "1")); // a chunk never written

const packed = Int16Array.from(field, (v) => (Number.isNaN(v) ? -32767 : Math.round(v * 10)));
await write("q", "int16", [nt, ny, nx], [1, ny, nx], packed, {
  dimensionNames: ["time", "lat", "lon"], fillValue: -32767, chunkSeparator: ".",
  attributes: { units: "kg kg-1", scale_factor: 0.0001, add_offset: 0.0, _FillValue: -32767 },
  codecs: [{ name: "bytes", configuration: { endian: "big" } }, { name: "gzip", configuration: { level: 1 } }, { name: "crc32c" }] });
// q's keys in the v2 spelling ("0.0.0"): zarrita writes the default encoding ("c.0.0.0" with this separator), so the keys are renamed and the metadata says so
const qMeta = JSON.parse(fs.readFileSync(path.join(storePath, "q", "zarr.json"), "utf8"));
qMeta.chunk_key_encoding = { name: "v2", configuration: { separator: "." } };
for (let t = 0; t < nt; t++) fs.renameSync(path.join(storePath, "q", `c.${t}.0.0`), path.join(storePath, "q", `${t}.0.0`));
fs.writeFileSync(path.join(storePath, "q", "zarr.json"), JSON.stringify(qMeta, null, 2));

// tcwv_shards: shards of 3 x 26 x 144 (the last row of shards beyond the array), inner chunks of 1 x 13 x 72, laid out by the sharding specification
const inner = [1, 13, 72], shard = [3, 26, 144];
const innerCodecs = [{ name: "bytes", configuration: { endian: "little" } }, ...compressor(codecName)];
const shardsMeta = {
  zarr_format: 3, node_type: "array", shape: [nt, ny, nx], data_type: "float32",
  chunk_grid: { name: "regular", configuration: { chunk_shape: shard } },
  chunk_key_encoding: { name: "default", configuration: { separator: "/" } },
  fill_value: "NaN", dimension_names: ["time", "lat", "lon"], attributes: tcwvAttributes,
  codecs: [{ name: "sharding_indexed", configuration: {
    chunk_shape: inner, codecs: innerCodecs,
    index_codecs: [{ name: "bytes", configuration: { endian: "little" } }, { name: "crc32c" }], index_location: "end" } }],
};
fs.mkdirSync(path.join(storePath, "tcwv_shards"), { recursive: true });
fs.writeFileSync(path.join(storePath, "tcwv_shards", "zarr.json"), JSON.stringify(shardsMeta, null, 2));
const bytesToBytes = [];
for (const c of compressor(codecName)) {
  const Codec = await zarr.registry.get(c.name)();
  bytesToBytes.push(Codec.fromConfig(c.configuration, { data_type: "float32", shape: inner, codecs: innerCodecs }));
}
const Crc = await zarr.registry.get("crc32c")();
const crc = Crc.fromConfig({}, {});
const per = shard.map((s, d) => s / inner[d]);
for (let s0 = 0; s0 * shard[0] < nt; s0++) {
  const pieces = [], index = new BigUint64Array(2 * per[0] * per[1] * per[2]).fill(0xFFFFFFFFFFFFFFFFn);
  let offset = 0, k = 0;
  for (let a = 0; a < per[0]; a++)
    for (let b = 0; b < per[1]; b++)
      for (let c = 0; c < per[2]; c++, k++) {
        if (s0 === 1 && a === 1 && b === 1 && c === 0) continue; // an inner chunk never written
        const chunk = new Float32Array(inner[0] * inner[1] * inner[2]).fill(NaN);
        for (let j = 0; j < inner[1]; j++)
          for (let i = 0; i < inner[2]; i++) {
            const t = s0 * shard[0] + a, y = b * inner[1] + j, x = c * inner[2] + i;
            if (t < nt && y < ny && x < nx) chunk[j * inner[2] + i] = field[(t * ny + y) * nx + x];
          }
        let bytes = new Uint8Array(chunk.buffer);
        for (const codec of bytesToBytes) bytes = await codec.encode(bytes);
        pieces.push(bytes);
        index[2 * k] = BigInt(offset);
        index[2 * k + 1] = BigInt(bytes.length);
        offset += bytes.length;
      }
  const indexBytes = await crc.encode(new Uint8Array(index.buffer));
  const dir = path.join(storePath, "tcwv_shards", "c", `${s0}`, "0");
  fs.mkdirSync(dir, { recursive: true });
  fs.writeFileSync(path.join(dir, "0"), Buffer.concat([...pieces.map((p) => Buffer.from(p)), Buffer.from(indexBytes)]));
}

// the witness: what zarrita reads back
const back = await zarr.open(store, { kind: "group" });
const out = [];
for (const name of ["tcwv", "q", "tcwv_shards"]) {
  const array = await zarr.open(back.resolve(name), { kind: "array" });
  const { data } = await zarr.get(array);
  out.push(Float64Array.from(data, Number));
}
fs.writeFileSync(outPath, Buffer.concat(out.map((a) => Buffer.from(a.buffer))));

if (layout === "consolidated") {
  const rootPath = path.join(storePath, "zarr.json");
  const rootMeta = JSON.parse(fs.readFileSync(rootPath, "utf8"));
  const documents = {};
  for (const name of ["time", "lat", "lon", "tcwv", "q", "tcwv_shards"]) {
    const file = path.join(storePath, name, "zarr.json");
    documents[name] = JSON.parse(fs.readFileSync(file, "utf8"));
    fs.rmSync(file);
  }
  rootMeta.consolidated_metadata = { kind: "inline", must_understand: false, metadata: documents };
  fs.writeFileSync(rootPath, JSON.stringify(rootMeta, null, 2));
}
