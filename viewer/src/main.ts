// jointloom view: loads the take from the server that served the page and replays it.
import { Vector3 } from 'three';
import { loadTake, type LoadedTake } from './api.js';
import { ForecastControl } from './forecast-control.js';
import { renderForecastPanel } from './forecast-panel.js';
import { ForecastView } from './forecast-view.js';
import { actionOf, keyLabel, SHORTCUTS, type Action } from './keys.js';
import { renderSummary } from './panel.js';
import { PairLines, paintLegendBar, type PairFilter } from './pairlines.js';
import { heatPairs, windowAt, type HeatSource } from './heat.js';
import { renderAsymmetry } from './asymmetry-panel.js';
import { Playback, SPEEDS } from './playback.js';
import { SkeletonView } from './skeleton.js';
import { addGrid, createStage, placeCamera, snapGrid } from './stage.js';
import { EventStrip } from './timeline.js';
import type { ViewHook } from './hook.js';
import { probe } from './probe.js';

declare global {
  interface Window {
    __jointloomView: ViewHook;
  }
}

/** Samples asked for with each forecast. */
const FORECAST_SAMPLES = 8;

const $ = <T extends HTMLElement>(id: string) => document.getElementById(id) as T;

const hook: ViewHook = {
  ready: false, error: null, frame: 0, sourceFrame: 0, rendered: 0, firstFrameMs: null, playing: false,
  forecastOn: false, forecastsReceived: 0, forecastTime: null, forecastStep: 0, heatSource: 'geometry', heatWindow: -1,
  seek: () => {}, setPlaying: () => {}, setForecast: () => {}, setHeat: () => {}, setPairs: () => {}, probe: () => ({ width: 0, height: 0, nonBackground: 0, left: 0, right: 0, hash: 0 }),
};
window.__jointloomView = hook;

function fillHelp(): void {
  const table = $<HTMLTableElement>('help-keys');
  for (const s of SHORTCUTS) {
    const tr = document.createElement('tr');
    const keys = document.createElement('td');
    s.keys.forEach((k, i) => {
      if (i) keys.append(' ');
      const kbd = document.createElement('kbd');
      kbd.textContent = keyLabel(k);
      keys.append(kbd);
    });
    const text = document.createElement('td');
    text.textContent = s.text;
    tr.append(keys, text);
    table.append(tr);
  }
}

function start(data: LoadedTake): void {
  const { take, positions, events, gait, pairs, factors } = data;
  $('take-name').textContent = take.file;
  $('take-facts').textContent =
    `${take.sourceFps.toFixed(take.sourceFps % 1 ? 2 : 0)} Hz · ${take.sourceFrames} frames · ${take.durationS.toFixed(1)} s · ${take.joints.length} joints · ${take.units}, up ${take.up}` +
    (take.stride > 1 ? ` · drawn at ${take.displayFps.toFixed(take.displayFps % 1 ? 2 : 0)} Hz` : '');
  $('caution').textContent = take.caution;
  renderSummary($('summary'), gait);

  const stageHost = $('stage');
  const stage = createStage(stageHost);
  const skeleton = new SkeletonView(take, positions);
  stage.scene.add(skeleton.group);
  const forecastView = take.forecast ? new ForecastView(take.forecast.nodes.length, take.forecast.bones, FORECAST_SAMPLES) : null;
  if (forecastView) stage.scene.add(forecastView.group);
  const initialPairs = pairs && pairs.pairs.length ? pairs : factors ? heatPairs(factors, 'static') : null;
  const pairLines = initialPairs ? new PairLines(initialPairs, positions, take.joints.length) : null;
  if (pairLines) stage.scene.add(pairLines.lines);
  renderAsymmetry($('asymmetry-panel'), factors, 'no model: started with --no-model');
  const legendFor = (vp: NonNullable<typeof initialPairs>, source: HeatSource) => {
    $('legend-title').textContent = `${vp.measure} (${vp.unit})`;
    $('legend-min').textContent = vp.min.toFixed(vp.max - vp.min < 1 ? 2 : 1);
    $('legend-max').textContent = vp.max.toFixed(vp.max - vp.min < 1 ? 2 : 1);
    $('legend-note').textContent = source === 'geometry' ? 'viridis · a geometric measure over the whole take, not the coupling model' : `viridis · coupling model factors, ${source === 'static' ? 'whole take' : 'window ending at this time'}`;
  };
  if (initialPairs) {
    legendFor(initialPairs, pairs && pairs.pairs.length ? 'geometry' : 'static');
    paintLegendBar($<HTMLCanvasElement>('legend-bar'));
  }

  // Grid and camera from the pelvis path.
  const p = { x: 0, y: 0, z: 0 }, q = { x: 0, y: 0, z: 0 };
  skeleton.jointAt(0, take.pelvis, p);
  skeleton.jointAt(take.displayFrames - 1, take.pelvis, q);
  let minX = Infinity, maxX = -Infinity, minZ = Infinity, maxZ = -Infinity;
  for (let d = 0; d < take.displayFrames; d += Math.max(1, Math.floor(take.displayFrames / 500))) {
    const r = skeleton.jointAt(d, take.pelvis, { x: 0, y: 0, z: 0 });
    minX = Math.min(minX, r.x); maxX = Math.max(maxX, r.x); minZ = Math.min(minZ, r.z); maxZ = Math.max(maxZ, r.z);
  }
  const grid = addGrid(stage, take.floorY);
  const gridMaterial = grid.material;
  const dir = new Vector3(q.x - p.x, 0, q.z - p.z);
  if (dir.length() < 0.5) dir.set(maxX - minX >= maxZ - minZ ? 1 : 0, 0, maxX - minX >= maxZ - minZ ? 0 : 1);
  dir.normalize();
  const anchor = new Vector3(p.x, p.y, p.z);
  const resetCamera = (d: number) => {
    skeleton.jointAt(d, take.pelvis, p);
    anchor.set(p.x, p.y, p.z);
    placeCamera(stage, anchor.clone(), dir);
  };
  resetCamera(0);

  const playback = new Playback(take.displayFrames, take.displayFps);
  const scrub = $<HTMLInputElement>('scrub');
  scrub.max = String(take.displayFrames - 1);
  const strip = new EventStrip($<HTMLCanvasElement>('events-strip'), take, events);
  const readout = $('readout');
  const playBtn = $<HTMLButtonElement>('btn-play');
  const speedSel = $<HTMLSelectElement>('speed');
  const followBox = $<HTMLInputElement>('follow');
  const pairsBox = $<HTMLInputElement>('pairs');
  const forecastBox = $<HTMLInputElement>('forecast');
  const forecastKey = $('key-forecast');
  const forecastPanel = $('forecast-panel');
  const forecast = forecastView && take.forecast
    ? new ForecastControl(forecastView, take.forecast, (st) => renderForecastPanel(forecastPanel, take.forecast, st), FORECAST_SAMPLES)
    : null;
  forecastBox.disabled = !forecast;
  if (!forecast) {
    $('forecast-label').textContent = 'no model given: forecast off';
    $('forecast-label').title = 'start the viewer without --no-model (or with --model FILE) to draw the forecast';
    renderForecastPanel(forecastPanel, null, { kind: 'off' });
  }
  const setForecast = (on: boolean) => {
    if (!forecast) return;
    forecastBox.checked = on;
    forecast.setOn(on);
    forecastKey.hidden = !on;
    hook.forecastOn = on;
    updateForecast();
  };
  const legend = $('legend');
  const help = $('help');
  let shown = -1;
  // Set below, once the heat controls exist; show() calls it for the dynamic heat.
  let applyHeat = (_d: number): void => {};

  const follow = (d: number) => {
    if (!followBox.checked) return;
    skeleton.jointAt(d, take.pelvis, p);
    const dx = p.x - anchor.x, dz = p.z - anchor.z;
    stage.controls.target.x += dx; stage.controls.target.z += dz;
    stage.camera.position.x += dx; stage.camera.position.z += dz;
    anchor.x = p.x; anchor.z = p.z;
  };
  const show = (d: number) => {
    if (d === shown) return;
    shown = d;
    skeleton.setFrame(d);
    applyHeat(d);
    pairLines?.setFrame(d);
    follow(d);
    skeleton.jointAt(d, take.pelvis, p);
    snapGrid(grid, p.x, p.z);
    scrub.value = String(d);
    const src = d * take.stride;
    readout.textContent = `${(src / take.sourceFps).toFixed(2)} s · frame ${src} / ${take.sourceFrames - 1}`;
    strip.draw(d);
    hook.frame = d;
    hook.sourceFrame = src;
  };
  const updateForecast = () => {
    if (!forecast) return;
    forecast.update((playback.frame * take.stride) / take.sourceFps, playback.playing);
    hook.forecastsReceived = forecast.received;
    hook.forecastStep = forecast.step;
    hook.forecastTime = forecast.step ? forecastView!.forecast!.time_s : null;
  };
  const setPlaying = (on: boolean) => {
    playback.playing = on;
    playBtn.textContent = on ? '❚❚ pause' : '▶ play';
    hook.playing = on;
  };
  const setPairs = (on: boolean) => {
    if (!pairLines) return;
    pairsBox.checked = on;
    pairLines.lines.visible = on;
    legend.hidden = !on;
    shown = -1;
    show(playback.frame);
  };
  pairsBox.disabled = !pairLines;
  const filterSel = $<HTMLSelectElement>('pair-filter');
  filterSel.disabled = !pairLines;
  const countText = $('legend-count');
  const setFilter = (f: PairFilter) => {
    if (!pairLines) return;
    const n = pairLines.setFilter(f);
    countText.textContent = `${n} of ${pairLines.source.pairs.length} pairs shown`;
    shown = -1;
    show(playback.frame);
  };
  setFilter('all');
  filterSel.addEventListener('change', () => setFilter(filterSel.value as PairFilter));
  // Heat source: the geometric spread, or the model's static or dynamic factors (dynamic follows the time).
  const heatSel = $<HTMLSelectElement>('heat-source');
  let heat: HeatSource = pairs && pairs.pairs.length ? 'geometry' : 'static';
  let heatWindow = -1;
  heatSel.value = heat;
  heatSel.disabled = !pairLines || !factors;
  applyHeat = (d: number) => {
    if (!pairLines || heat !== 'dynamic' || !factors) return;
    const w = windowAt(factors.times, (d * take.stride) / take.sourceFps);
    if (w === heatWindow) return;
    heatWindow = w;
    const vp = heatPairs(factors, 'dynamic', w);
    pairLines.setSource(vp);
    legendFor(vp, 'dynamic');
    hook.heatWindow = w;
  };
  const setHeat = (source: HeatSource) => {
    if (!pairLines || (source !== 'geometry' && !factors) || (source === 'geometry' && !(pairs && pairs.pairs.length))) return;
    heat = source;
    heatSel.value = source;
    hook.heatSource = source;
    heatWindow = -1;
    if (source === 'dynamic') applyHeat(playback.frame);
    else {
      const vp = source === 'static' ? heatPairs(factors!, 'static') : pairs!;
      pairLines.setSource(vp);
      legendFor(vp, source);
    }
    countText.textContent = `${pairLines.setFilter(filterSel.value as PairFilter)} of ${pairLines.source.pairs.length} pairs shown`;
    shown = -1;
    show(playback.frame);
  };
  heatSel.addEventListener('change', () => setHeat(heatSel.value as HeatSource));
  hook.heatSource = heat;
  const eventFrames = events.events.filter((e) => e.kind === 'initial_contact').map((e) => Math.round(e.frame / take.stride)).sort((a, b) => a - b);
  const act = (a: Action) => {
    switch (a) {
      case 'play': setPlaying(!playback.playing); break;
      case 'back': show(playback.step(-1)); setPlaying(false); break;
      case 'forward': show(playback.step(1)); setPlaying(false); break;
      case 'back1s': show(playback.step(-Math.round(take.displayFps))); setPlaying(false); break;
      case 'forward1s': show(playback.step(Math.round(take.displayFps))); setPlaying(false); break;
      case 'start': show(playback.seek(0)); break;
      case 'end': show(playback.seek(take.displayFrames - 1)); break;
      case 'slower': case 'faster': speedSel.value = String(playback.nextSpeed(a === 'faster' ? 1 : -1)); break;
      case 'nextEvent': { const f = eventFrames.find((x) => x > playback.frame); if (f !== undefined) { setPlaying(false); show(playback.seek(f)); } break; }
      case 'prevEvent': { const f = [...eventFrames].reverse().find((x) => x < playback.frame); if (f !== undefined) { setPlaying(false); show(playback.seek(f)); } break; }
      case 'follow': followBox.checked = !followBox.checked; if (followBox.checked) resetCamera(playback.frame); break;
      case 'pairs': setPairs(!pairsBox.checked); break;
      case 'heat': { const order: HeatSource[] = pairs && pairs.pairs.length ? ['geometry', 'static', 'dynamic'] : ['static', 'dynamic']; setHeat(order[(order.indexOf(heat) + 1) % order.length]!); break; }
      case 'forecast': setForecast(!forecastBox.checked); break;
      case 'camera': resetCamera(playback.frame); break;
      case 'help': help.hidden = !help.hidden; break;
      case 'close': help.hidden = true; break;
    }
  };

  playBtn.addEventListener('click', () => act('play'));
  $('btn-back').addEventListener('click', () => act('back'));
  $('btn-fwd').addEventListener('click', () => act('forward'));
  $('btn-start').addEventListener('click', () => act('start'));
  $('help-button').addEventListener('click', () => act('help'));
  help.addEventListener('click', (e) => { if (e.target === help) help.hidden = true; });
  speedSel.addEventListener('change', () => { playback.speed = Number(speedSel.value) || 1; if (!SPEEDS.includes(playback.speed)) playback.speed = 1; });
  followBox.addEventListener('change', () => { if (followBox.checked) resetCamera(playback.frame); });
  pairsBox.addEventListener('change', () => setPairs(pairsBox.checked));
  forecastBox.addEventListener('change', () => setForecast(forecastBox.checked));
  scrub.addEventListener('input', () => { setPlaying(false); show(playback.seek(Number(scrub.value))); });
  const stripCanvas = $<HTMLCanvasElement>('events-strip');
  stripCanvas.addEventListener('pointerdown', (e) => { setPlaying(false); show(playback.seek(strip.frameAt(e.clientX))); });
  window.addEventListener('keydown', (e) => {
    if (e.target instanceof HTMLSelectElement) return;
    const a = actionOf(e);
    if (!a) return;
    e.preventDefault();
    act(a);
  });

  const resize = () => {
    const w = Math.max(1, stageHost.clientWidth), h = Math.max(1, stageHost.clientHeight);
    stage.renderer.setSize(w, h, false);
    stage.camera.aspect = w / h;
    stage.camera.updateProjectionMatrix();
    const px = stage.renderer.getPixelRatio();
    skeleton.setResolution(w * px, h * px);
    gridMaterial.resolution.set(w * px, h * px);
    pairLines?.material.resolution.set(w * px, h * px);
    forecastView?.setResolution(w * px, h * px);
    shown = -1;
    show(playback.frame);
  };
  new ResizeObserver(resize).observe(stageHost);
  resize();

  const status = $('status');
  let last = performance.now(), fpsCount = 0, fpsSince = last;
  const render = () => {
    stage.controls.update();
    stage.renderer.render(stage.scene, stage.camera);
    hook.rendered++;
  };
  const loop = (now: number) => {
    const dt = Math.min(0.25, (now - last) / 1000);
    last = now;
    show(playback.advance(dt));
    updateForecast();
    render();
    if (hook.firstFrameMs === null) hook.firstFrameMs = performance.now();
    fpsCount++;
    if (now - fpsSince >= 1000) {
      status.textContent = `${Math.round((fpsCount * 1000) / (now - fpsSince))} fps`;
      fpsCount = 0;
      fpsSince = now;
    }
    requestAnimationFrame(loop);
  };
  requestAnimationFrame(loop);

  hook.seek = (d: number) => { setPlaying(false); show(playback.seek(d)); };
  hook.setPlaying = setPlaying;
  hook.setForecast = setForecast;
  hook.setHeat = (src: string) => setHeat(src as HeatSource);
  hook.setPairs = setPairs;
  hook.probe = () => { updateForecast(); render(); return probe(stage.renderer, stage.background); };
  hook.ready = true;
}

fillHelp();
loadTake().then(start, (err: unknown) => {
  const message = err instanceof Error ? err.message : String(err);
  hook.error = message;
  $('take-name').textContent = 'could not load the take';
  $('status').textContent = message;
});
