#version 330 core
// Ambient plus one directional key light with a soft highlight, in linear
// light; the result is sRGB-encoded here (IEC 61966-2-1) so the window and
// the offscreen snapshots hold the same bytes. The paint atlas is an sRGB
// texture: sampling decodes it to linear light.
in vec3 vNormal;
in vec2 vAtlas;
in vec3 vWorld;
uniform sampler2D uPaint;
uniform vec3 uTowardsLight;
uniform float uAmbient;
uniform float uKey;
uniform vec3 uEye;
out vec4 fragColour;
vec3 encodeSrgb(vec3 c) {
  c = clamp(c, 0.0, 1.0);
  return mix(12.92 * c, 1.055 * pow(c, vec3(1.0 / 2.4)) - 0.055, step(vec3(0.0031308), c));
}
void main() {
  vec3 towardsEye = normalize(uEye - vWorld);
  vec3 n = normalize(vNormal);
  if (dot(n, towardsEye) < 0.0) n = -n;  // both sides lit (the bore seen through the open end)
  vec3 albedo = texture(uPaint, vAtlas).rgb;
  float diffuse = max(dot(n, uTowardsLight), 0.0);
  float highlight = 0.2 * pow(max(dot(n, normalize(uTowardsLight + towardsEye)), 0.0), 40.0);
  vec3 c = albedo * (uAmbient + uKey * diffuse) + uKey * highlight;
  fragColour = vec4(encodeSrgb(c), 1.0);
}
