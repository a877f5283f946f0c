// The page the step benchmark's part A runs in headless Chromium: plain <video> elements over the
// app's signed media links, driven by hand-written JavaScript (kept as a string, so no compiler
// helper ends up in code the browser runs). It exposes window.stepBench with two measurements:
//
// plainSeeks: one visible <video>; each step sets currentTime to the middle of the target frame
//   and waits for the requestVideoFrameCallback whose mediaTime is that frame's time.
// doubleBuffer: two <video>s over the same file, stacked; while the "reader types" (a fixed
//   pause), the one underneath is pre-seeked to the next row and confirmed with rVFC. On "Enter"
//   the two swap (the standby is waited for first if its frame is not decoded yet); the time runs
//   from Enter to the next animation frame after the swap (the frame that composites the swap),
//   and, as paintMs, to the animation frame after that (the swap has been painted).
//
// Both count frames presented that are not the target ("wrong") and steps that settled on a
// wrong frame.

export const STEP_PAGE_HTML = `<!doctype html>
<html><head><meta charset="utf-8"><title>step benchmark</title>
<style>body{margin:0;background:#222}#stage{position:relative;width:960px;height:540px}video{position:absolute;left:0;top:0;width:960px;height:540px;background:#000}</style>
</head><body><div id="stage"></div>
<script>
const sleep = (ms) => new Promise((r) => setTimeout(r, ms));
const nextFrame = () => new Promise((r) => requestAnimationFrame(() => r(performance.now())));

function makeVideo(src, z) {
  const v = document.createElement('video');
  v.muted = true;
  v.preload = 'auto';
  v.playsInline = true;
  v.style.zIndex = String(z);
  v.src = src;
  document.getElementById('stage').appendChild(v);
  return v;
}

function dispose(v) {
  v.removeAttribute('src');
  v.load();
  v.remove();
}

function loaded(v) {
  return new Promise((resolve, reject) => {
    if (v.readyState >= 2) return resolve();
    v.addEventListener('loadeddata', () => resolve(), { once: true });
    v.addEventListener('error', () => reject(new Error('the video did not load: ' + (v.error ? v.error.message : 'unknown error'))), { once: true });
  });
}

// Seeks and resolves at the first rVFC showing the target frame; a presented frame that is not
// the target counts as wrong, and a seek that has finished on a wrong frame resolves with ok=false.
function seekAndConfirm(v, target, halfFrame) {
  return new Promise((resolve, reject) => {
    let wrong = 0;
    const timer = setTimeout(() => reject(new Error('no frame at ' + target.pts + ' s within 5 s')), 5000);
    const onFrame = (_now, meta) => {
      const at = performance.now();
      if (Math.abs(meta.mediaTime - target.pts) < halfFrame) {
        clearTimeout(timer);
        resolve({ at, ok: true, wrong, mediaTime: meta.mediaTime });
        return;
      }
      wrong++;
      if (!v.seeking) {
        clearTimeout(timer);
        resolve({ at, ok: false, wrong, mediaTime: meta.mediaTime });
        return;
      }
      v.requestVideoFrameCallback(onFrame);
    };
    v.requestVideoFrameCallback(onFrame);
    v.currentTime = target.seek;
  });
}

window.stepBench = {
  async plainSeeks(src, targets, halfFrame, pauseMs) {
    const v = makeVideo(src, 1);
    try {
      await loaded(v);
      await seekAndConfirm(v, targets[0], halfFrame);
      const out = [];
      for (let i = 1; i < targets.length; i++) {
        await sleep(pauseMs);
        const t0 = performance.now();
        const r = await seekAndConfirm(v, targets[i], halfFrame);
        out.push({ ms: r.at - t0, ok: r.ok, wrong: r.wrong });
      }
      return out;
    } finally {
      dispose(v);
    }
  },

  async doubleBuffer(src, targets, halfFrame, typingMs) {
    let shown = makeVideo(src, 1);
    let standby = makeVideo(src, 0);
    const preSeek = (v, target) => {
      const job = { done: false, promise: null };
      job.promise = seekAndConfirm(v, target, halfFrame).then((r) => {
        job.done = true;
        return r;
      });
      return job;
    };
    try {
      await Promise.all([loaded(shown), loaded(standby)]);
      await seekAndConfirm(shown, targets[0], halfFrame);
      let pending = preSeek(standby, targets[1]);
      const out = [];
      for (let i = 1; i < targets.length; i++) {
        await sleep(typingMs);
        const t0 = performance.now();
        const readyAtEnter = pending.done;
        const r = await pending.promise;
        standby.style.zIndex = '1';
        shown.style.zIndex = '0';
        const frame = await nextFrame();
        // The callback of the animation frame after that runs once the swapped frame is painted.
        const painted = await nextFrame();
        out.push({ ms: frame - t0, paintMs: painted - t0, ok: r.ok, wrong: r.wrong, readyAtEnter });
        [shown, standby] = [standby, shown];
        if (i + 1 < targets.length) pending = preSeek(standby, targets[i + 1]);
      }
      return out;
    } finally {
      dispose(shown);
      dispose(standby);
    }
  },
};
</script></body></html>`;

export interface StepTarget {
  /** Where to seek: the middle of the frame. */
  seek: number;
  /** The frame's presentation time, as rVFC's mediaTime reports it. */
  pts: number;
}

export interface StepSample {
  ms: number;
  /** The step settled on the target frame. */
  ok: boolean;
  /** Frames presented on the way that were not the target. */
  wrong: number;
  /** Double buffer only: to the second animation frame after the swap (painted). */
  paintMs?: number;
  /** Double buffer only: the standby's frame was decoded before Enter. */
  readyAtEnter?: boolean;
}
