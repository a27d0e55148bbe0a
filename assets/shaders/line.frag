#version 330 core
// One flat colour per draw, already sRGB-encoded by the caller (lines, the table).
uniform vec3 uEncodedColour;
out vec4 fragColour;
void main() { fragColour = vec4(uEncodedColour, 1.0); }
