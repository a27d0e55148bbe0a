#version 330 core
// One flat colour per draw, already sRGB-encoded by the caller (lines, the
// table, the translucent ceiling).
uniform vec3 uEncodedColour;
uniform float uOpacity;
out vec4 fragColour;
void main() { fragColour = vec4(uEncodedColour, uOpacity); }
