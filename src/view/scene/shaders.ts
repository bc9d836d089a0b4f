/**
 * GLSL 3 shaders. Cells read their value from a float texture by cell id (texelFetch), so a new
 * field or colour range never touches the vertex buffers.
 */
const HEADER = `precision highp float;
precision highp int;
precision highp sampler2D;
`;

export const CELL_VERTEX = `${HEADER}
uniform mat4 projectionMatrix;
uniform mat4 modelViewMatrix;
in vec2 position;
in float cellId;
flat out int vId;
void main() {
  vId = int(cellId + 0.5);
  gl_Position = projectionMatrix * modelViewMatrix * vec4(position, 0.0, 1.0);
}
`;

/** uScale: 0 linear, 1 log (uLo/uHi are natural logs), 2 category (value = palette index). */
export const CELL_FRAGMENT = `${HEADER}
uniform sampler2D uValues;
uniform sampler2D uDt;
uniform sampler2D uPalette;
uniform sampler2D uCategories;
uniform int uWidth;
uniform int uScale;
uniform float uLo;
uniform float uHi;
uniform bool uThresholdOn;
uniform float uThreshold;
uniform int uSelected;
uniform vec3 uNoLimit;
uniform vec3 uUndefined;
uniform vec3 uZero;
uniform vec3 uGrey;
uniform vec3 uSelectedColour;
uniform bool uMarkOn;
uniform float uMarkBound;
uniform vec3 uMarkColour;
flat in int vId;
out vec4 outColour;
void main() {
  ivec2 at = ivec2(vId % uWidth, vId / uWidth);
  float v = texelFetch(uValues, at, 0).r;
  float dt = texelFetch(uDt, at, 0).r;
  vec3 c;
  if (uThresholdOn && dt > uThreshold) {
    c = uGrey;
  } else if (v < -1.5) {
    c = uUndefined;
  } else if (v < -0.5) {
    c = uNoLimit;
  } else if (uScale == 2) {
    c = texelFetch(uCategories, ivec2(clamp(int(v + 0.5), 0, 15), 0), 0).rgb;
  } else if (uScale == 1 && v <= 0.0) {
    c = uZero;
  } else {
    float t = uScale == 1 ? (log(v) - uLo) / (uHi - uLo) : (v - uLo) / (uHi - uLo);
    t = clamp(t, 0.0, 1.0);
    c = texture(uPalette, vec2((t * 255.0 + 0.5) / 256.0, 0.5)).rgb;
  }
  // marked cells (step within the chosen factor of the limit) get screen-space stripes
  if (uMarkOn && dt <= uMarkBound && mod(gl_FragCoord.x + gl_FragCoord.y, 9.0) < 2.5) c = uMarkColour;
  if (vId == uSelected) c = mix(c, uSelectedColour, 0.45);
  outColour = vec4(c, 1.0);
}
`;

/** Edges fade in as they grow from uMinPx to 2·uMinPx on screen; shorter ones are not drawn. */
export const EDGE_VERTEX = `${HEADER}
uniform mat4 projectionMatrix;
uniform mat4 modelViewMatrix;
uniform float uPxPerUnit;
uniform float uMinPx;
in vec2 position;
in float len;
out float vAlpha;
void main() {
  float px = len * uPxPerUnit;
  vAlpha = clamp((px - uMinPx) / uMinPx, 0.0, 1.0);
  gl_Position = vAlpha > 0.0 ? projectionMatrix * modelViewMatrix * vec4(position, 0.0, 1.0) : vec4(2.0, 2.0, 2.0, 1.0);
}
`;

export const EDGE_FRAGMENT = `${HEADER}
uniform vec3 uColour;
uniform float uOpacity;
in float vAlpha;
out vec4 outColour;
void main() {
  outColour = vec4(uColour, uOpacity * vAlpha);
}
`;

/**
 * Rings of a fixed pixel size at cell centroids, for cells too small to see: a ring is drawn
 * while its cell (size = its thickness in model units) spans at most uMaxPx pixels; 0 = always.
 */
export const RING_VERTEX = `${HEADER}
uniform mat4 projectionMatrix;
uniform mat4 modelViewMatrix;
uniform float uSize;
uniform float uPxPerUnit;
uniform float uMaxPx;
in vec2 position;
in float size;
void main() {
  gl_PointSize = uSize;
  bool show = size == 0.0 || size * uPxPerUnit <= uMaxPx;
  gl_Position = show ? projectionMatrix * modelViewMatrix * vec4(position, 0.0, 1.0) : vec4(2.0, 2.0, 2.0, 1.0);
}
`;

export const RING_FRAGMENT = `${HEADER}
uniform vec3 uColour;
uniform vec3 uBorder;
out vec4 outColour;
void main() {
  float r = length(gl_PointCoord * 2.0 - 1.0);
  if (r > 1.0 || r < 0.45) discard;
  outColour = vec4(r > 0.8 || r < 0.58 ? uBorder : uColour, 1.0);
}
`;

export const LINE_VERTEX = `${HEADER}
uniform mat4 projectionMatrix;
uniform mat4 modelViewMatrix;
in vec2 position;
void main() {
  gl_Position = projectionMatrix * modelViewMatrix * vec4(position, 0.0, 1.0);
}
`;

export const LINE_FRAGMENT = `${HEADER}
uniform vec3 uColour;
out vec4 outColour;
void main() {
  outColour = vec4(uColour, 1.0);
}
`;
