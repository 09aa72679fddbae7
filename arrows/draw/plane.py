"""Plane geometry on complex numbers (the point x + iy), shared by the layout, the structures and
the curved arrows: unit vectors, the gaps between directions round a centre, segments that cross,
points inside polygons."""
from __future__ import annotations

import cmath
import math
from typing import Optional, Sequence

import numpy as np


def unit(z: complex) -> complex:
    size = abs(z)
    return z / size if size > 1e-12 else 1 + 0j


def collinear(points: list[complex]) -> bool:
    """Whether the points lie on one line (within a hundredth of a bond length)."""
    first, last = min(points, key=lambda z: (z.real, z.imag)), max(points, key=lambda z: (z.real, z.imag))
    along = unit(last - first)
    return all(abs(((p - first) * along.conjugate()).imag) < 0.01 for p in points)


def unit_or_zero(z: complex) -> complex:
    size = abs(z)
    return z / size if size > 1e-12 else 0j


def distance_to_segment(p: complex, a: complex, b: complex) -> float:
    """How far point p is from the segment a-b."""
    along = b - a
    length2 = along.real * along.real + along.imag * along.imag
    t = 0.0 if length2 < 1e-18 else max(0.0, min(1.0, ((p - a) * along.conjugate()).real / length2))
    return abs(p - (a + t * along))


def angular_gaps(centre: complex, others: Sequence[complex]) -> list[tuple[float, float]]:
    """The gaps between the directions from centre to `others`, each as (start, end) angles
    counterclockwise, the last one wrapping round past pi."""
    directions = sorted(cmath.phase(o - centre) for o in others if abs(o - centre) > 1e-9)
    return [(a, directions[(k + 1) % len(directions)] + (2 * math.pi if k + 1 == len(directions) else 0))
            for k, a in enumerate(directions)]


def free_direction(centre: complex, others: Sequence[complex], prefer: Optional[complex] = None) -> complex:
    """Unit vector from centre into the widest gap between the directions to `others`.

    With no neighbours any direction is free: `prefer` (or +x) is used."""
    gaps = angular_gaps(centre, others)
    if not gaps:
        return prefer / abs(prefer) if prefer else 1 + 0j
    if len(gaps) == 1:
        return -cmath.rect(1.0, gaps[0][0])
    best_gap, best_mid = -1.0, 0.0
    for a, b in gaps:
        if b - a > best_gap + 1e-9:
            best_gap, best_mid = b - a, (a + b) / 2
    return cmath.rect(1.0, best_mid)


def gap_around(direction: complex, others: Sequence[complex]) -> float:
    """The angle of the gap between the directions `others` (unit vectors) that `direction` stands in."""
    turns = [cmath.phase(o / direction) % (2 * math.pi) for o in others]   # counterclockwise from it
    return min(turns) + min(2 * math.pi - t for t in turns)


def gap_beside(centre: complex, others: Sequence[complex], target: complex) -> complex:
    """Unit vector from centre into the wider of the two gaps between the directions to `others`
    that border the direction to `target` (one of them)."""
    aim = cmath.phase(target - centre)
    best_gap, best_mid = -1.0, aim
    for a, b in angular_gaps(centre, others):
        borders = min(abs(cmath.phase(cmath.rect(1.0, a - aim))), abs(cmath.phase(cmath.rect(1.0, b - aim)))) < 1e-6
        if borders and b - a > best_gap + 1e-9:
            best_gap, best_mid = b - a, (a + b) / 2
    return cmath.rect(1.0, best_mid)


def gap_facing(centre: complex, others: Sequence[complex], target: complex) -> complex:
    """Unit vector from centre into the middle of the gap between the directions to `others`
    whose middle lies nearest the direction to `target`."""
    aim = unit(target - centre)
    middles = [cmath.rect(1.0, (a + b) / 2) for a, b in angular_gaps(centre, others)]
    return max(middles, key=lambda d: (d * aim.conjugate()).real) if middles else aim


def crosses_any(p: np.ndarray, q: np.ndarray, walls: np.ndarray) -> list[bool]:
    """For each segment p[k]-q[k]: whether it crosses one of `walls` (rows of two ends), that is,
    each has the other's ends on opposite sides. The cross products are written out on real
    and imaginary parts, as Python's complex arithmetic computes them, whatever the shape; both
    ends of a wall (and of a segment) are taken in one batch, numpy's cost being per call."""
    px, py = p.real[:, None, None], p.imag[:, None, None]
    dx, dy = (q.real - p.real)[:, None, None], (q.imag - p.imag)[:, None, None]    # along p->q
    wx, wy = walls.real, walls.imag                                                # (walls, 2 ends)
    wall_sides = (wy - py) * dx - (wx - px) * dy        # (segments, walls, 2): each wall end's side of p-q
    ax, ay = wx[:, :1], wy[:, :1]
    ex, ey = wx[:, 1:] - ax, wy[:, 1:] - ay             # along each wall
    ends = np.concatenate((p[:, None], q[:, None]), axis=1)[:, None, :]        # (segments, 1, 2 ends)
    segment_sides = (ends.imag - ay) * ex - (ends.real - ax) * ey   # each segment end's side of the wall
    crossed = ((wall_sides[..., 0] * wall_sides[..., 1] < 0)
               & (segment_sides[..., 0] * segment_sides[..., 1] < 0))
    return np.logical_or.reduce(crossed, axis=1).tolist()


def segments_cross(p: complex, q: complex, a: complex, b: complex) -> bool:
    """Whether segment p-q crosses segment a-b (each has the other's ends on opposite sides):
    crosses_any for one segment and one wall, without numpy's cost per call."""
    dx, dy, ex, ey = q.real - p.real, q.imag - p.imag, b.real - a.real, b.imag - a.imag
    a_side = (a.imag - p.imag) * dx - (a.real - p.real) * dy
    b_side = (b.imag - p.imag) * dx - (b.real - p.real) * dy
    p_side = (p.imag - a.imag) * ex - (p.real - a.real) * ey
    q_side = (q.imag - a.imag) * ex - (q.real - a.real) * ey
    return a_side * b_side < 0 and p_side * q_side < 0


def any_inside_polygons(points, polygons: list[list[complex]]) -> bool:
    """Whether any of `points` (a row of a numpy array, or Python numbers) lies inside any of
    `polygons`: a cluster placed into someone else's ring. (Read as Python numbers, and only
    where there is a ring to be inside.)"""
    if not polygons:
        return False
    if isinstance(points, np.ndarray):
        points = points.tolist()
    return any(inside_polygon(p, poly) for p in points for poly in polygons)


def inside_polygon(point: complex, polygon: list[complex]) -> bool:
    """Even-odd rule."""
    inside = False
    for a, b in zip(polygon, polygon[1:] + polygon[:1]):
        if (a.imag > point.imag) != (b.imag > point.imag):
            x = a.real + (point.imag - a.imag) * (b.real - a.real) / (b.imag - a.imag)
            if x > point.real:
                inside = not inside
    return inside
