"""Motions driven by the loads: free heave of the aircraft and its trim."""
