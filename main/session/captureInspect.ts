/**
 * The Bench screen's view of a capture sent to it: its channels with a first look at each (app/formats/
 * capturePreview.ts), how it would be read with the roles given or the design's (the same layout and channel map as
 * `rampwright analyze`), and, when it cannot be read yet, why and which field settles it.
 */
import { readFile } from 'node:fs/promises';
import { open } from 'node:fs/promises';
import { extname } from 'node:path';
import { formatChannelMap, parseChannelMap, type ChannelMap, type ChannelPick } from '../../app/capture/channelMap';
import { signalRoles } from '../../app/capture/samples';
import type { BoardDesign } from '../../app/board/design';
import type { CaptureField, CapturePreviewResult, CaptureReadFields } from '../../app/contract';
import { isInputError } from '../../app/errors';
import { minMaxTrace, previewComtrade, previewCsv, type CapturePreview } from '../../app/formats/capturePreview';
import { mapComtradeChannels } from '../../app/formats/comtradeChannelMap';
import type { ComtradeConfig } from '../../app/formats/comtradeConfig';
import { parseComtradeConfig } from '../../app/formats/comtradeConfigParse';
import { comtradeCffSections } from '../../app/formats/comtradeCffReader';
import { describeComtradeRecord } from '../../app/formats/comtradeDataReader';
import { ratePlanOf } from '../../app/formats/comtradeRecordPlan';
import { layoutCsv } from '../../app/formats/csvLayout';
import { csvSniffBytes } from '../../app/formats/csvReader';
import type { ReadCaptureOptions } from '../capture/readCaptureFile';
import type { CaptureUpload } from './captureUploads';

/** Where a refusal sends the technician: the field of the form named by the command line's option in its message. */
const fieldOfOption: readonly [string, CaptureField][] = [
  ['--map', 'channelMap'],
  ['--separator', 'separator'],
  ['--decimal', 'decimal'],
  ['--time-unit', 'timeUnit'],
  ['--header-line', 'headerLine'],
  ['--rate', 'sampleRateHz'],
];

/** The message in the screen's words: the command line's option names become the form's field names. */
export function forTheScreen(message: string): { message: string; field: CaptureField | null } {
  const found = fieldOfOption.find(([option]) => message.includes(option));
  const words: Record<string, string> = {
    '--map': 'the roles',
    '--separator': 'Separator',
    '--decimal': 'Decimal mark',
    '--time-unit': 'Time unit',
    '--header-line': 'Line of the column names',
    '--rate': 'Sample rate',
  };
  // The request for a map reads, on the screen, as a request to choose the roles below.
  let text = message.replace(/name the channel for each role with --map, e\.g\. --map (\S+)/, 'choose which channel is each role below (for example $1)');
  for (const [option, word] of Object.entries(words)) text = text.split(`${option} `).join(`${word}: `).split(option).join(word);
  return { message: text, field: found ? found[1] : null };
}

/** Reading options from the form: the roles as the command line writes them, the CSV fields, the design's map. */
export function readOptionsOf(fields: CaptureReadFields, design: BoardDesign | null): ReadCaptureOptions {
  return {
    channelMap: fields.channelMap ? parseChannelMap(fields.channelMap, 'the roles') : undefined,
    defaultMap: design?.channelMap,
    separator: fields.separator,
    decimal: fields.decimal,
    timeUnit: fields.timeUnit,
    headerLine: fields.headerLine,
    sampleRateHz: fields.sampleRateHz,
  };
}

async function headOf(path: string, bytes: number): Promise<{ head: Uint8Array; complete: boolean }> {
  const handle = await open(path, 'r');
  try {
    const { size } = await handle.stat();
    const head = new Uint8Array(Math.min(size, bytes));
    const { bytesRead } = await handle.read(head, 0, head.length, 0);
    return { head: head.subarray(0, bytesRead), complete: bytesRead >= size };
  } finally {
    await handle.close();
  }
}

/** A role's pick in the map's words: the channel's own name when no other channel has it, else its number. */
function pickText(pick: ChannelPick, reference: string, name: string, uniqueName: boolean): ChannelPick {
  return { ...pick, channel: uniqueName && name.trim() !== '' ? name.trim() : /^\d+$/.test(reference) ? Number(reference) : reference };
}

interface Reading {
  channelMap: string | null;
  roles: CapturePreviewResult['roles'];
  mapSource: CapturePreviewResult['mapSource'];
  readAs: string | null;
}

type RoleChoices = NonNullable<CapturePreviewResult['roles']>;

function noRoles(): RoleChoices {
  return { sync: null, ramp: null, gate: null, control: null };
}

function readCsvWith(preview: CapturePreview, fields: CaptureReadFields, design: BoardDesign | null, source: string): Reading {
  if (preview.dialect === null) return { channelMap: null, roles: null, mapSource: null, readAs: null };
  const layout = layoutCsv(preview.dialect, readOptionsOf(fields, design), source);
  const names = preview.channels.map((channel) => channel.name.trim().toLowerCase());
  const map: ChannelMap = {};
  const roles = noRoles();
  for (const role of signalRoles) {
    const entry = layout.roles[role];
    if (entry === null) continue;
    const channel = preview.channels[entry.channel.column.number - 1];
    const unique = names.filter((name) => name === channel.name.trim().toLowerCase()).length === 1;
    map[role] = pickText(entry.pick, channel.reference, channel.name, unique);
    roles[role] = { reference: channel.reference, scale: entry.pick.scale, invert: entry.pick.invert };
  }
  return { channelMap: formatChannelMap(map), roles, mapSource: layout.mapUsed, readAs: layout.readAs };
}

function readComtradeWith(preview: CapturePreview, config: ComtradeConfig, fields: CaptureReadFields, design: BoardDesign | null, source: string): Reading {
  const options = readOptionsOf(fields, design);
  const sources = mapComtradeChannels(config, options.channelMap, source, options.defaultMap);
  const readAs = describeComtradeRecord(config, ratePlanOf(config, source), sources);
  const names = preview.channels.map((channel) => channel.name.trim().toLowerCase());
  const map: ChannelMap = {};
  const roles = noRoles();
  const usedDesign = options.channelMap === undefined && options.defaultMap !== undefined && signalRoles.some((role) => options.defaultMap?.[role] !== undefined && sources[role] !== null);
  const usedMap = options.channelMap ?? (usedDesign ? options.defaultMap : undefined);
  for (const role of signalRoles) {
    const found = sources[role];
    if (found === null) continue;
    const channel = preview.channels[found.kind === 'analog' ? found.index : config.analogChannels.length + found.index];
    const unique = names.filter((name) => name === channel.name.trim().toLowerCase()).length === 1;
    const pick = usedMap?.[role] ?? { channel: role, scale: 1, invert: false };
    map[role] = pickText(pick, channel.reference, channel.name, unique);
    roles[role] = { reference: channel.reference, scale: pick.scale, invert: pick.invert };
  }
  return { channelMap: formatChannelMap(map), roles, mapSource: fields.channelMap ? 'given' : usedDesign ? 'design' : 'names', readAs };
}

/** The first look at an uploaded capture and how it reads with the fields given. */
export async function inspectUploadedCapture(upload: CaptureUpload, fields: CaptureReadFields, design: BoardDesign | null): Promise<CapturePreviewResult> {
  const source = upload.files.map((file) => file.name).join(' + ');
  const extension = extname(upload.mainPath).toLowerCase();
  let preview: CapturePreview;
  let config: ComtradeConfig | null = null;
  let reading: Reading = { channelMap: null, roles: null, mapSource: null, readAs: null };
  let problem: CapturePreviewResult['problem'] = null;
  try {
    if (extension === '.csv') {
      const { head, complete } = await headOf(upload.mainPath, csvSniffBytes);
      preview = previewCsv(head, complete, readOptionsOf({ ...fields, channelMap: undefined }, null), upload.files[0].name);
    } else if (extension === '.cff') {
      const { head } = await headOf(upload.mainPath, 1 << 20);
      const sections = comtradeCffSections(head, upload.files[0].name);
      config = parseComtradeConfig(sections.configText, upload.files[0].name);
      preview = previewComtrade(config, sections.data, upload.files[0].name);
    } else {
      const dataFile = upload.files.find((file) => extname(file.name).toLowerCase() === '.dat');
      const configFile = upload.files.find((file) => extname(file.name).toLowerCase() === '.cfg');
      if (!dataFile || !configFile) throw new Error('a COMTRADE upload without its pair (checked at its start)');
      config = parseComtradeConfig(new TextDecoder('latin1').decode(await readFile(configFile.path)), configFile.name);
      preview = previewComtrade(config, (await headOf(dataFile.path, 1 << 20)).head, dataFile.name);
    }
  } catch (error) {
    if (!isInputError(error)) throw error;
    const screen = forTheScreen(error.message);
    return { uploadId: upload.id, fileNames: upload.files.map((file) => file.name), format: extension === '.csv' ? 'csv' : 'comtrade', channels: [], samples: 0, channelMap: null, roles: null, mapSource: null, readAs: null, problem: screen };
  }
  try {
    reading = config === null ? readCsvWith(preview, fields, design, source) : readComtradeWith(preview, config, fields, design, source);
  } catch (error) {
    if (!isInputError(error)) throw error;
    problem = forTheScreen(error.message);
  }
  return {
    uploadId: upload.id,
    fileNames: upload.files.map((file) => file.name),
    format: config === null ? 'csv' : 'comtrade',
    channels: preview.channels.map((channel) => {
      const trace = minMaxTrace(channel.values, 80);
      return { reference: channel.reference, name: channel.name, label: channel.label, unit: channel.unit, kind: channel.kind, minV: trace.minV, maxV: trace.maxV, trace: trace.points };
    }),
    samples: preview.samples,
    ...reading,
    problem,
  };
}
