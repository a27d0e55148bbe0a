#version 330 core
// Flat-coloured geometry in the lab frame: grid lines, traces, the spin axis, the table top, the ceiling.
layout(location = 0) in vec3 aPosition;
uniform mat4 uClipFromWorld;
uniform mat4 uWorldFromModel;
void main() { gl_Position = uClipFromWorld * uWorldFromModel * vec4(aPosition, 1.0); }
