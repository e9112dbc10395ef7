"""Forming: springback, jig formers, hand-bender marks, bend order, feasibility."""
