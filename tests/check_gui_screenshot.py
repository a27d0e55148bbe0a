#!/usr/bin/env python3
"""Checks a `dwellmark gui --screenshot` picture: the expected size, not
blank, body-coloured pixels in the 3D view, a picture in the observer panel.
Usage: check_gui_screenshot.py SHOT.png SCENARIO.json WIDTH HEIGHT
The panel rectangles come from SHOT.png.json, written beside the picture."""
import json
import struct
import sys
import zlib


def read_png(path):
    """8-bit RGB or RGBA, non-interlaced PNG -> (width, height, rows of (r, g, b))."""
    data = open(path, "rb").read()
    assert data[:8] == b"\x89PNG\r\n\x1a\n", "not a PNG"
    pos, idat, width = 8, b"", 0
    while pos < len(data):
        length, kind = struct.unpack(">I4s", data[pos:pos + 8])
        body = data[pos + 8:pos + 8 + length]
        if kind == b"IHDR":
            width, height, depth, colour, _, _, interlace = struct.unpack(">IIBBBBB", body)
            assert depth == 8 and colour in (2, 6) and interlace == 0, "unsupported PNG layout"
            channels = 3 if colour == 2 else 4
        elif kind == b"IDAT":
            idat += body
        pos += 12 + length
    raw = zlib.decompress(idat)
    stride = width * channels
    rows, prev = [], bytearray(stride)
    for y in range(height):
        kind = raw[y * (stride + 1)]
        line = bytearray(raw[y * (stride + 1) + 1:(y + 1) * (stride + 1)])
        for i in range(stride):
            a = line[i - channels] if i >= channels else 0
            b = prev[i]
            c = prev[i - channels] if i >= channels else 0
            if kind == 1:
                line[i] = (line[i] + a) & 255
            elif kind == 2:
                line[i] = (line[i] + b) & 255
            elif kind == 3:
                line[i] = (line[i] + (a + b) // 2) & 255
            elif kind == 4:
                p = a + b - c
                pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
                line[i] = (line[i] + (a if pa <= pb and pa <= pc else b if pb <= pc else c)) & 255
        rows.append([tuple(line[x * channels:x * channels + 3]) for x in range(width)])
        prev = line
    return width, height, rows


def linear(v):
    """sRGB byte to linear light (IEC 61966-2-1)."""
    v /= 255.0
    return v / 12.92 if v <= 0.04045 else ((v + 0.055) / 1.055) ** 2.4


def chromaticity(rgb):
    lin = [linear(v) for v in rgb]
    total = sum(lin)
    return (lin[0] / total, lin[1] / total) if total > 0 else (1 / 3, 1 / 3)


def region(rows, rect):
    x, y, w, h = (int(round(v)) for v in rect)
    return [px for row in rows[y + 2:y + h - 2] for px in row[x + 2:x + w - 2]]


def main():
    shot, scenario, want_w, want_h = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4])
    width, height, rows = read_png(shot)
    layout = json.load(open(shot + ".json"))["regions_px_xywh"]
    failures = []
    if (width, height) != (want_w, want_h):
        failures.append(f"size {width} x {height}, expected {want_w} x {want_h}")
    everything = [px for row in rows for px in row]
    if len(set(everything)) < 200:
        failures.append(f"only {len(set(everything))} distinct colours: the window looks blank")

    # Body pixels: the body's colour (shaded: same chromaticity, any
    # brightness from the ambient level up) within the 3D view. A 0.01
    # chromaticity tolerance separates the near-white body from the
    # orange table and the coloured traces (our own choice).
    body_hex = json.load(open(scenario))["body"]["colour"]
    body = tuple(int(body_hex[i:i + 2], 16) for i in (1, 3, 5))
    target = chromaticity(body)
    view = region(rows, layout["view3d"])
    body_pixels = sum(1 for px in view if min(px) > 60 and
                      abs(chromaticity(px)[0] - target[0]) < 0.01 and abs(chromaticity(px)[1] - target[1]) < 0.01)
    if body_pixels < 500:
        failures.append(f"{body_pixels} body-coloured pixels in the 3D view, expected at least 500")

    # The observer panel holds a picture: many colours, not one flat fill.
    observer = region(rows, layout["observer"])
    if len(set(observer)) < 100:
        failures.append(f"observer panel has {len(set(observer))} distinct colours: no picture")

    print(f"screenshot {width} x {height}: {body_pixels} body pixels in the 3D view, "
          f"{len(set(observer))} colours in the observer panel")
    for f in failures:
        print("FAIL:", f)
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
