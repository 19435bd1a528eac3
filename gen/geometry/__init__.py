"""Pure numpy geometry: involutes, basic racks, generated tooth profiles, sections.

Nothing in this package imports cadquery, OCP or trimesh. Lengths are mm, angles radians.
"""
