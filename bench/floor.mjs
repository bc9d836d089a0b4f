/**
 * The floor of an audit: read the file and decode its arrays on one thread, nothing else, through
 * the reading path of the command (readMeshFile: raw appended arrays in place, whole-file read
 * otherwise, native zlib, pieces of a .pvtu).
 * Usage: node bench/floor.mjs FILE   → prints {"cells": n}
 */
import { readMeshFile } from '../dist/cli/large-vtu.js';

const mesh = readMeshFile(process.argv[2]);
process.stdout.write(JSON.stringify({ cells: mesh.nCells }) + '\n');
