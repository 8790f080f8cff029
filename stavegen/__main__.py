from .cli import main

if __name__ == "__main__":  # imported again as __mp_main__ in worker processes, where nothing must run
    main()
