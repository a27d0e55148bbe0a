#version 330 core
// Lit surfaces of the 3D view: the body, painted from its atlas.
layout(location = 0) in vec3 aPosition;
layout(location = 1) in vec3 aNormal;
layout(location = 2) in vec2 aAtlas;
uniform mat4 uClipFromWorld;
uniform mat4 uWorldFromModel;
uniform mat3 uNormalWorldFromModel;
out vec3 vNormal;
out vec2 vAtlas;
out vec3 vWorld;
void main() {
  vec4 world = uWorldFromModel * vec4(aPosition, 1.0);
  vWorld = world.xyz;
  vNormal = uNormalWorldFromModel * aNormal;
  vAtlas = aAtlas;
  gl_Position = uClipFromWorld * world;
}
