// `jointloom view <take>`: replay a take in the browser, served on the loopback interface until Ctrl-C.
import type { Command } from 'commander';
import { defaultModelPath } from '../model/default-model.js';
import { loadModel } from '../model/modelfile.js';
import { importTake } from '../skeleton/import.js';
import { buildViewData } from '../view/data.js';
import { ForecastService } from '../view/forecast.js';
import { loopbackHost } from '../view/host.js';
import { viewerRoot } from '../view/paths.js';
import { startViewServer } from '../view/server.js';
import { CAUTION } from './caution.js';
import { VERSION, newCommand, numberOption } from './program.js';
import { importOptionsFrom, withImportOptions, type ImportFlags } from './import-options.js';

interface ViewFlags extends ImportFlags {
  model?: string | false;
  port: number;
  host: string;
}

/** Registers `view` on the program. */
export function register(program: Command): void {
  const cmd = newCommand('view')
    .description('replay a take in the browser: skeleton, playback, gait events on the timeline, the gait summary and, with the coupling model (the shipped one unless --model or --no-model), the forecast of the next second from the current time, the factor heat on the pair lines and the ranked coupling asymmetry (served on 127.0.0.1 only; stop with Ctrl-C)')
    .argument('<take>', 'BVH file to show')
    .option('--model <file>', 'coupling model file from `jointloom fit` (default: the shipped model)')
    .option('--no-model', 'no model: forecast and factor heat off')
    .option('--port <n>', 'port to listen on (0: a free port)', numberOption(0, 65535, true), 0)
    .option('--host <address>', 'loopback address to listen on: 127.0.0.1, another 127.x.x.x, or ::1', '127.0.0.1');
  withImportOptions(cmd).action(async (path: string, flags: ViewFlags) => {
    const host = loopbackHost(flags.host);
    const imported = importTake(path, importOptionsFrom(flags));
    const modelPath = flags.model === false ? null : flags.model ?? defaultModelPath();
    const forecast = modelPath ? new ForecastService(imported, loadModel(modelPath), modelPath) : null;
    const data = buildViewData(imported, { version: VERSION, caution: CAUTION });
    const server = await startViewServer({ staticRoot: viewerRoot(), data, host, port: flags.port, forecast });
    for (const w of imported.warnings) process.stderr.write(`jointloom: warning: ${w}\n`);
    process.stdout.write(`jointloom view: ${server.url}\n`);
    await new Promise<void>((resolve) => {
      const stop = () => {
        process.off('SIGINT', stop);
        process.off('SIGTERM', stop);
        resolve();
      };
      process.on('SIGINT', stop);
      process.on('SIGTERM', stop);
    });
    await server.close();
  });
  program.addCommand(cmd);
}
