// Generated movies for the shard tests: discs and bars on 0/1 frames whose domains cross, merge,
// split, nucleate and vanish at chosen frames, written as one .npy stack.
import { writeFileSync } from "node:fs";
import { encodeNpy } from "../../src/io/npy";
import { canvas, disc, bar, type Canvas } from "../tracking/movie";

export const SIZE = 48;

/**
 * Frame k of a 16-frame movie. Events are placed so that cuts at 4, 8 and 12 (four shards of
 * four frames) and at every other position when other N are tried fall on them:
 * - a bubble moving right by 2 px per frame through every frame;
 * - two bubbles that approach and merge at frame 8, then split again at frame 12;
 * - a bar that breaks into two pieces at frame 4;
 * - a bubble nucleating at frame 4, another right after a cut at frame 9, one collapsing at 8
 *   (first frame without it) and one gone in the last frame of a shard (frame 11 is its last).
 */
export function shardMovieFrame(k: number): Canvas {
  const c = canvas(SIZE, SIZE);
  disc(c, 4 + 2 * k, 6, 3);                       // mover, crosses every cut
  const gap = k < 8 ? 8 - k : k < 12 ? 0 : k - 11; // merges at 8, splits at 12
  if (gap === 0) bar(c, 14, 18, 30, 22);
  else { disc(c, 18 - gap, 20, 3); disc(c, 26 + gap, 20, 3); }
  if (k < 4) bar(c, 4, 30, 20, 33);               // a bar ...
  else { bar(c, 4, 30, 10, 33); bar(c, 14, 30, 20, 33); } // ... in two pieces from frame 4
  if (k >= 4) disc(c, 36, 36, 2);                 // nucleates at 4
  if (k >= 9) disc(c, 40, 12, 2);                 // nucleates right after a cut at 8 | 9
  if (k < 8) disc(c, 30, 42, 2 + (k % 2));        // collapses: gone from frame 8
  if (k <= 11) disc(c, 42, 26, 2);                // last seen in frame 11
  return c;
}

export const MOVIE_FRAMES = 16;

export function writeShardMovie(path: string, frames = MOVIE_FRAMES): void {
  writeFileSync(path, encodeNpy(Array.from({ length: frames }, (_, k) => shardMovieFrame(k))));
}
